import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Role } from '@kinetwin/shared/protocol/api-types';
import type { InvitationCreateRequest, InvitationSummary, Mailbox, TeamResponse } from '@kinetwin/shared/protocol/library-api';
import { type Observable, map } from 'rxjs';

/** Answer of POST /api/team/invitations: whether the e-mail went out as well. */
export interface CreatedInvitation extends InvitationSummary {
  emailSent: boolean;
}

/** The team: members and roles (everyone reads; admins change), invitations and the dev mailbox (admins). */
@Injectable({ providedIn: 'root' })
export class TeamApi {
  private readonly http = inject(HttpClient);

  team(): Observable<TeamResponse> {
    return this.http.get<TeamResponse>('/api/team');
  }

  setRole(memberId: number, role: Role): Observable<{ id: number; role: Role }> {
    return this.http.patch<{ id: number; role: Role }>(`/api/team/members/${memberId}`, { role });
  }

  removeMember(memberId: number): Observable<void> {
    return this.http.delete<void>(`/api/team/members/${memberId}`);
  }

  invitations(): Observable<InvitationSummary[]> {
    return this.http.get<{ items: InvitationSummary[] }>('/api/team/invitations').pipe(map((body) => body.items));
  }

  invite(request: InvitationCreateRequest): Observable<CreatedInvitation> {
    return this.http.post<CreatedInvitation>('/api/team/invitations', request);
  }

  revokeInvitation(id: number): Observable<void> {
    return this.http.delete<void>(`/api/team/invitations/${id}`);
  }

  mailbox(): Observable<Mailbox> {
    return this.http.get<Mailbox>('/api/dev/mailbox');
  }
}
