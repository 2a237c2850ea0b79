import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { MAX_DISPLAY_NAME_LENGTH, MAX_TEAM_NAME_LENGTH } from '@kinetwin/shared/protocol/library-api';
import { AccountApi } from '../core/account-api';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';
import { passwordRule } from './password-check';

/** Sign-up without an invitation: a new account that founds its own team as its admin. */
@Component({
  selector: 'kt-sign-up',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule, RouterLink],
  template: `
    <main class="auth-page">
      <section class="card">
        <h1>Create an account</h1>
        <p class="note">A new account starts its own team, with you as its admin. To join an existing team, use the invitation link a team admin e-mailed you.</p>
        <form [formGroup]="form" (ngSubmit)="signUp()" novalidate>
          <mat-form-field appearance="outline">
            <mat-label>Email</mat-label>
            <input matInput name="email" type="email" formControlName="email" autocomplete="username" data-test="sign-up-email" />
            @if (form.controls.email.invalid) {
              <mat-error>Enter a valid e-mail address.</mat-error>
            }
          </mat-form-field>
          <mat-form-field appearance="outline">
            <mat-label>Your name</mat-label>
            <input matInput name="displayName" formControlName="displayName" autocomplete="name" data-test="sign-up-name" [maxLength]="maxName" />
            @if (form.controls.displayName.invalid) {
              <mat-error>Enter the name teammates will see.</mat-error>
            }
          </mat-form-field>
          <mat-form-field appearance="outline">
            <mat-label>Password</mat-label>
            <input matInput name="password" type="password" formControlName="password" autocomplete="new-password" data-test="sign-up-password" />
            @if (form.controls.password.hasError('passwordRule')) {
              <mat-error>{{ form.controls.password.getError('passwordRule') }}</mat-error>
            } @else if (form.controls.password.invalid) {
              <mat-error>Choose a password of at least 10 characters.</mat-error>
            }
          </mat-form-field>
          <mat-form-field appearance="outline">
            <mat-label>Team name (optional)</mat-label>
            <input matInput name="teamName" formControlName="teamName" data-test="sign-up-team" [maxLength]="maxTeam" />
          </mat-form-field>
          @if (error(); as message) {
            <p class="error" role="alert" data-test="sign-up-error">{{ message }}</p>
          }
          <button mat-flat-button type="submit" data-test="sign-up" [disabled]="busy() || passwordErrorShown()">{{ busy() ? 'Creating…' : 'Create account' }}</button>
        </form>
        <p class="links"><a routerLink="/sign-in">I have an account</a></p>
      </section>
    </main>
  `,
  styleUrl: './auth-page.css',
})
export class SignUp {
  private readonly accounts = inject(AccountApi);
  private readonly router = inject(Router);

  protected readonly maxName = MAX_DISPLAY_NAME_LENGTH;
  protected readonly maxTeam = MAX_TEAM_NAME_LENGTH;
  private readonly email = new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.email] });
  protected readonly form = new FormGroup({
    email: this.email,
    displayName: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    password: new FormControl('', { nonNullable: true, validators: [Validators.required, passwordRule((): string => this.email.value)] }),
    teamName: new FormControl('', { nonNullable: true }),
  });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  /** Every value, status and touched change of the form, so signals can follow it. */
  private readonly formChange = toSignal(this.form.events, { initialValue: null });
  /**
   * Whether the password field shows its error (as Material does: invalid once touched): the
   * button stays off until it is fixed, so a press never sends what the page already refuses.
   */
  protected readonly passwordErrorShown = computed(() => {
    this.formChange();
    const password = this.form.controls.password;
    return password.invalid && (password.touched || password.dirty);
  });

  constructor() {
    // The password rule reads the e-mail (a password must not contain it): judge it again when the e-mail changes.
    this.email.valueChanges.subscribe(() => this.form.controls.password.updateValueAndValidity());
  }

  protected async signUp(): Promise<void> {
    this.form.controls.password.updateValueAndValidity();
    if (this.form.invalid || this.busy()) {
      this.form.markAllAsTouched();
      return;
    }
    const { email, displayName, password, teamName } = this.form.getRawValue();
    this.busy.set(true);
    this.error.set(null);
    try {
      await this.accounts.signUp({ email, displayName, password, ...(teamName.trim() ? { teamName } : {}) });
      await this.router.navigateByUrl('/library');
    } catch (failure) {
      const fields = apiFieldErrors(failure);
      this.error.set(fields.length ? `${apiErrorMessage(failure)} ${fields.map((f) => f.message).join('; ')}` : apiErrorMessage(failure));
    } finally {
      this.busy.set(false);
    }
  }
}
