import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { type Role, roles } from '@kinetwin/shared/protocol/api-types';
import type { ActivityPage, InvitationSummary, TeamResponse } from '@kinetwin/shared/protocol/library-api';
import { firstValueFrom, switchMap } from 'rxjs';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';
import { LibraryApi } from '../core/library-api';
import type { LoadState } from '../core/load-state';
import { Session } from '../core/session';
import { TeamApi } from '../core/team-api';
import { readyValue, toLoadState } from '../core/to-load-state';
import { activityText } from '../scenario/activity-text';

/** What each role may do, as README's "Team library" section states it. */
const ROLE_TEXT: Record<Role, string> = {
  viewer: 'reads the team’s scenarios and runs them on the bench',
  engineer: 'also creates, imports, duplicates and edits own scenarios, comments and hands off',
  lead: 'also signs off revisions',
  admin: 'also edits any scenario and manages members and invitations',
};

/** Team activity entries shown at once. */
export const TEAM_ACTIVITY_PAGE_SIZE = 25;

/** Members, roles and invitations (admins), and the team's activity log. */
@Component({
  selector: 'kt-team-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule],
  templateUrl: './team-page.html',
  styleUrl: './team-page.css',
})
export class TeamPage {
  private readonly api = inject(TeamApi);
  private readonly library = inject(LibraryApi);

  protected readonly roles = roles;
  protected readonly roleText = ROLE_TEXT;
  protected readonly me = inject(Session).user;
  private readonly reloads = signal(0);
  protected readonly team = toSignal(toObservable(this.reloads).pipe(switchMap(() => this.api.team().pipe(toLoadState()))), { initialValue: { status: 'loading' } as LoadState<TeamResponse> });
  protected readonly invitationsState = toSignal(toObservable(this.reloads).pipe(switchMap(() => this.api.invitations().pipe(toLoadState()))), {
    initialValue: { status: 'loading' } as LoadState<InvitationSummary[]>,
  });
  protected readonly activityState = toSignal(toObservable(this.reloads).pipe(switchMap(() => this.library.teamActivity(1, TEAM_ACTIVITY_PAGE_SIZE).pipe(toLoadState()))), {
    initialValue: { status: 'loading' } as LoadState<ActivityPage>,
  });
  protected readonly members = computed(() => readyValue(this.team())?.members ?? []);
  protected readonly teamName = computed(() => readyValue(this.team())?.team.name ?? '');
  protected readonly invitations = computed(() => readyValue(this.invitationsState()) ?? []);
  protected readonly activity = computed(() => readyValue(this.activityState())?.items ?? []);
  protected readonly loadFailure = computed(() => {
    const state = this.team();
    return state.status === 'failed' ? state.message : null;
  });
  protected readonly describe = activityText;

  protected readonly inviteEmail = signal('');
  protected readonly inviteRole = signal<Role>('engineer');
  private readonly busy = signal(false);
  protected readonly working = this.busy.asReadonly();
  private readonly note = signal<{ error: boolean; text: string } | null>(null);
  protected readonly message = this.note.asReadonly();

  protected async setRole(memberId: number, role: Role): Promise<void> {
    await this.act(async () => {
      await firstValueFrom(this.api.setRole(memberId, role));
      return `Role changed to ${role}.`;
    });
  }

  protected async remove(memberId: number, name: string): Promise<void> {
    await this.act(async () => {
      await firstValueFrom(this.api.removeMember(memberId));
      return `${name} was removed; their revisions and comments stay.`;
    });
  }

  protected async invite(): Promise<void> {
    const email = this.inviteEmail().trim();
    if (!email) return;
    await this.act(async () => {
      const created = await firstValueFrom(this.api.invite({ email, role: this.inviteRole() }));
      this.inviteEmail.set('');
      return created.emailSent ? `Invitation sent to ${created.email}.` : `Invitation to ${created.email} stored, but the e-mail could not be sent; invite again later.`;
    });
  }

  protected async revoke(invitation: InvitationSummary): Promise<void> {
    await this.act(async () => {
      await firstValueFrom(this.api.revokeInvitation(invitation.id));
      return `Invitation to ${invitation.email} revoked.`;
    });
  }

  private async act(action: () => Promise<string>): Promise<void> {
    if (this.busy()) return;
    this.busy.set(true);
    this.note.set(null);
    try {
      this.note.set({ error: false, text: await action() });
    } catch (failure) {
      const fields = apiFieldErrors(failure);
      this.note.set({ error: true, text: fields.length ? `${apiErrorMessage(failure)} ${fields.map((f) => f.message).join('; ')}` : apiErrorMessage(failure) });
    } finally {
      this.busy.set(false);
      this.reloads.update((n) => n + 1);
    }
  }
}
