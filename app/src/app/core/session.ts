import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { Injectable, inject, signal } from '@angular/core';
import type { SessionUser, SignInRequest } from '@kinetwin/shared/protocol/api-types';
import { firstValueFrom } from 'rxjs';

interface UserResponse {
  user: SessionUser;
}

/** Who is signed in. The session itself is a cookie the server sets; this only mirrors its user. */
@Injectable({ providedIn: 'root' })
export class Session {
  private readonly http = inject(HttpClient);

  private readonly currentUser = signal<SessionUser | null>(null);
  readonly user = this.currentUser.asReadonly();

  /** Asks the server who is signed in: the user, or null when the server says 401. Other failures reject. */
  async refresh(): Promise<SessionUser | null> {
    try {
      const { user } = await firstValueFrom(this.http.get<UserResponse>('/api/auth/me'));
      this.currentUser.set(user);
      return user;
    } catch (failure) {
      if (failure instanceof HttpErrorResponse && failure.status === 401) {
        this.currentUser.set(null);
        return null;
      }
      throw failure;
    }
  }

  /** Rejects with the HttpErrorResponse on a wrong password (401) or too many attempts (429). */
  async signIn(credentials: SignInRequest): Promise<SessionUser> {
    const { user } = await firstValueFrom(this.http.post<UserResponse>('/api/auth/sign-in', credentials));
    this.currentUser.set(user);
    return user;
  }

  async signOut(): Promise<void> {
    try {
      await firstValueFrom(this.http.post('/api/auth/sign-out', null));
    } finally {
      // Forget the user locally even when the request failed: the next guarded page asks again.
      this.currentUser.set(null);
    }
  }

  /** Called when the server answers 401 to a signed-in request: the cookie expired or was revoked. */
  forget(): void {
    this.currentUser.set(null);
  }
}
