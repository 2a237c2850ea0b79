import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { type InvitationPreview, MAX_DISPLAY_NAME_LENGTH } from '@kinetwin/shared/protocol/library-api';
import { of, switchMap } from 'rxjs';
import { AccountApi } from '../core/account-api';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';
import type { LoadState } from '../core/load-state';
import { readyValue, toLoadState } from '../core/to-load-state';
import { passwordRule } from './password-check';

/** The page an invitation e-mail links to (`/accept-invitation?token=…`): join the team with the invited role. */
@Component({
  selector: 'kt-accept-invitation',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, MatButtonModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule, RouterLink],
  template: `
    <main class="auth-page">
      <section class="card">
        <h1>Join a team</h1>
        @switch (preview().status) {
          @case ('loading') {
            <p class="note">Checking the invitation…</p>
          }
          @case ('failed') {
            <p class="error" role="alert" data-test="invitation-error">{{ failure() }}</p>
            <p class="note">Ask the admin who invited you for a new link.</p>
          }
          @case ('ready') {
            @if (invitation(); as offer) {
              <p data-test="invitation-offer">
                <strong>{{ offer.teamName }}</strong> invites <strong>{{ offer.email }}</strong> as <strong>{{ offer.role }}</strong>. The link works once and
                expires {{ offer.expiresAt | date: 'yyyy-MM-dd HH:mm' }}.
              </p>
              <form [formGroup]="form" (ngSubmit)="accept()" novalidate>
                <mat-form-field appearance="outline">
                  <mat-label>Your name</mat-label>
                  <input matInput name="displayName" formControlName="displayName" autocomplete="name" data-test="invitation-name" [maxLength]="maxName" />
                </mat-form-field>
                <mat-form-field appearance="outline">
                  <mat-label>Password</mat-label>
                  <input matInput name="password" type="password" formControlName="password" autocomplete="new-password" data-test="invitation-password" />
                  @if (form.controls.password.hasError('passwordRule')) {
                    <mat-error>{{ form.controls.password.getError('passwordRule') }}</mat-error>
                  } @else if (form.controls.password.invalid) {
                    <mat-error>Choose a password of at least 10 characters.</mat-error>
                  }
                </mat-form-field>
                @if (error(); as message) {
                  <p class="error" role="alert" data-test="accept-error">{{ message }}</p>
                }
                <button mat-flat-button type="submit" data-test="accept-invitation" [disabled]="busy()">{{ busy() ? 'Joining…' : 'Join ' + offer.teamName }}</button>
              </form>
            }
          }
        }
        <p class="links"><a routerLink="/sign-in">Sign in instead</a></p>
      </section>
    </main>
  `,
  styleUrl: './auth-page.css',
})
export class AcceptInvitation {
  private readonly accounts = inject(AccountApi);
  private readonly router = inject(Router);

  /** From the link's query string. */
  readonly token = input<string | undefined>(undefined);

  protected readonly maxName = MAX_DISPLAY_NAME_LENGTH;
  protected readonly preview = toSignal(
    toObservable(this.token).pipe(
      switchMap((token) =>
        token
          ? this.accounts.lookupInvitation(token).pipe(toLoadState())
          : of<LoadState<InvitationPreview>>({ status: 'failed', message: 'This page needs the invitation link from your e-mail; the link has no token.' }),
      ),
    ),
    { initialValue: { status: 'loading' } as LoadState<InvitationPreview> },
  );
  protected readonly invitation = computed(() => readyValue(this.preview()));
  protected readonly failure = computed(() => {
    const state = this.preview();
    return state.status === 'failed' ? state.message : '';
  });
  protected readonly form = new FormGroup({
    displayName: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    password: new FormControl('', { nonNullable: true, validators: [Validators.required, passwordRule(() => this.invitation()?.email ?? '')] }),
  });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected async accept(): Promise<void> {
    const offer = this.invitation();
    const token = this.token();
    if (!offer || !token || this.form.invalid || this.busy()) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    try {
      const { displayName, password } = this.form.getRawValue();
      await this.accounts.signUp({ email: offer.email, displayName, password, invitationToken: token });
      await this.router.navigateByUrl('/library');
    } catch (failure) {
      const fields = apiFieldErrors(failure);
      this.error.set(fields.length ? `${apiErrorMessage(failure)} ${fields.map((f) => f.message).join('; ')}` : apiErrorMessage(failure));
    } finally {
      this.busy.set(false);
    }
  }
}
