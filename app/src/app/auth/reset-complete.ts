import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { MIN_PASSWORD_LENGTH } from '@kinetwin/shared/protocol/library-api';
import { AccountApi } from '../core/account-api';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';

/** The page a reset e-mail links to (`/reset-password?token=…`): choose a new password, which signs out every other session. */
@Component({
  selector: 'kt-reset-complete',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule, RouterLink],
  template: `
    <main class="auth-page">
      <section class="card">
        <h1>Choose a new password</h1>
        @if (!token()) {
          <p class="error" role="alert" data-test="reset-error">This page needs the link from your e-mail; the link has no token.</p>
        } @else {
          <p class="note">Setting it signs you out everywhere else.</p>
          <form [formGroup]="form" (ngSubmit)="complete()" novalidate>
            <mat-form-field appearance="outline">
              <mat-label>New password</mat-label>
              <input matInput name="password" type="password" formControlName="password" autocomplete="new-password" data-test="new-password" />
              @if (form.controls.password.invalid) {
                <mat-error>At least {{ minLength }} characters.</mat-error>
              }
            </mat-form-field>
            <mat-form-field appearance="outline">
              <mat-label>The same password again</mat-label>
              <input matInput name="repeat" type="password" formControlName="repeat" autocomplete="new-password" data-test="repeat-password" />
            </mat-form-field>
            @if (error(); as message) {
              <p class="error" role="alert" data-test="reset-error">{{ message }}</p>
            }
            <button mat-flat-button type="submit" data-test="complete-reset" [disabled]="busy()">Set the password</button>
          </form>
        }
        <p class="links"><a routerLink="/forgot-password">Ask for a new link</a><a routerLink="/sign-in">Sign in</a></p>
      </section>
    </main>
  `,
  styleUrl: './auth-page.css',
})
export class ResetComplete {
  private readonly accounts = inject(AccountApi);
  private readonly router = inject(Router);

  readonly token = input<string | undefined>(undefined);

  protected readonly minLength = MIN_PASSWORD_LENGTH;
  protected readonly form = new FormGroup({
    password: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.minLength(MIN_PASSWORD_LENGTH)] }),
    repeat: new FormControl('', { nonNullable: true }),
  });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected async complete(): Promise<void> {
    const token = this.token();
    const { password, repeat } = this.form.getRawValue();
    if (!token || this.form.invalid || this.busy()) {
      this.form.markAllAsTouched();
      return;
    }
    if (password !== repeat) {
      this.error.set('The two passwords differ; type the same one twice.');
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    try {
      // The server checks strength against the account's e-mail, which this page does not know.
      await this.accounts.completeReset({ token, password });
      await this.router.navigateByUrl('/library');
    } catch (failure) {
      const fields = apiFieldErrors(failure);
      this.error.set(fields.length ? `${apiErrorMessage(failure)} ${fields.map((f) => f.message).join('; ')}` : apiErrorMessage(failure));
    } finally {
      this.busy.set(false);
    }
  }
}
