import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { AccountApi } from '../core/account-api';
import { apiErrorMessage } from '../core/api-error-message';

/** Asks for a password-reset link by e-mail; the answer is the same whether or not the address has an account. */
@Component({
  selector: 'kt-reset-request',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule, RouterLink],
  template: `
    <main class="auth-page">
      <section class="card">
        <h1>Reset your password</h1>
        <p class="note">We e-mail a link that works once and expires after an hour.</p>
        <form (submit)="$event.preventDefault(); requestLink()" novalidate>
          <mat-form-field appearance="outline">
            <mat-label>Email</mat-label>
            <input matInput name="email" type="email" [formControl]="email" autocomplete="username" data-test="reset-email" />
            @if (email.invalid) {
              <mat-error>Enter the e-mail address of your account.</mat-error>
            }
          </mat-form-field>
          @if (done(); as message) {
            <p class="done" role="status" data-test="reset-requested">{{ message }}</p>
          }
          @if (error(); as message) {
            <p class="error" role="alert" data-test="reset-error">{{ message }}</p>
          }
          <button mat-flat-button type="submit" data-test="request-reset" [disabled]="busy()">Send the link</button>
        </form>
        <p class="links"><a routerLink="/sign-in">Back to sign-in</a></p>
      </section>
    </main>
  `,
  styleUrl: './auth-page.css',
})
export class ResetRequest {
  private readonly accounts = inject(AccountApi);

  protected readonly email = new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.email] });
  protected readonly busy = signal(false);
  protected readonly done = signal<string | null>(null);
  protected readonly error = signal<string | null>(null);

  protected async requestLink(): Promise<void> {
    if (this.email.invalid || this.busy()) {
      this.email.markAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    this.done.set(null);
    try {
      this.done.set((await firstValueFrom(this.accounts.requestReset(this.email.value.trim()))).message);
    } catch (failure) {
      this.error.set(apiErrorMessage(failure));
    } finally {
      this.busy.set(false);
    }
  }
}
