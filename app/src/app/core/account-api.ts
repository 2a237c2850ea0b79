import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { InvitationPreview, PasswordResetComplete, SignedIn, SignUpRequest } from '@kinetwin/shared/protocol/library-api';
import { type Observable, firstValueFrom } from 'rxjs';
import { Session } from './session';

/** Accounts before sign-in: sign-up (with or without an invitation) and password reset. */
@Injectable({ providedIn: 'root' })
export class AccountApi {
  private readonly http = inject(HttpClient);
  private readonly session = inject(Session);

  /** Creates the account, then asks the server who is signed in so the Session knows. */
  async signUp(request: SignUpRequest): Promise<void> {
    await firstValueFrom(this.http.post<SignedIn>('/api/auth/sign-up', request));
    await this.session.refresh();
  }

  lookupInvitation(token: string): Observable<InvitationPreview> {
    return this.http.post<InvitationPreview>('/api/auth/invitations/lookup', { token });
  }

  /** Always answers with the same sentence, whether or not the address has an account. */
  requestReset(email: string): Observable<{ message: string }> {
    return this.http.post<{ message: string }>('/api/auth/password-reset/request', { email });
  }

  /** Sets the new password (which ends every other session) and signs this browser in. */
  async completeReset(request: PasswordResetComplete): Promise<void> {
    await firstValueFrom(this.http.post<SignedIn>('/api/auth/password-reset/complete', request));
    await this.session.refresh();
  }

  /** Ends every session of the signed-in user, this one included. */
  signOutEverywhere(): Observable<void> {
    return this.http.post<void>('/api/auth/sign-out-everywhere', {});
  }
}
