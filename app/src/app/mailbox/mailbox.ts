import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { Mailbox as MailboxBody } from '@kinetwin/shared/protocol/library-api';
import { switchMap } from 'rxjs';
import type { LoadState } from '../core/load-state';
import { TeamApi } from '../core/team-api';
import { readyValue, toLoadState } from '../core/to-load-state';
import { type MailSegment, mailSegments } from './mail-segments';

/**
 * The dev mailbox (admins): mail the local outbox transport kept for the team instead of sending
 * it. Shown as plain text with its http(s) addresses as links, so no message can run script or
 * fetch anything in this page.
 */
@Component({
  selector: 'kt-mailbox',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, MatButtonModule, MatIconModule],
  template: `
    <section class="page">
      <header class="heading">
        <h1>Dev mailbox</h1>
        <button mat-stroked-button type="button" data-test="refresh-mailbox" (click)="refresh()"><mat-icon>refresh</mat-icon> Refresh</button>
      </header>
      <p class="note">Messages the server kept in its outbox for your team (MAIL_TRANSPORT=outbox). Links in them work here; use SMTP in production.</p>
      @switch (state().status) {
        @case ('loading') {
          <p class="note">Loading the mailbox…</p>
        }
        @case ('failed') {
          <p class="error" role="alert" data-test="mailbox-error">{{ failure() }}</p>
        }
        @case ('ready') {
          @for (message of messages(); track message.id) {
            <details data-test="mail-message" class="message">
              <summary>
                <strong>{{ message.subject }}</strong>
                <span class="meta">to {{ message.to }} · {{ message.createdAt | date: 'yyyy-MM-dd HH:mm:ss' }}</span>
              </summary>
              <pre data-test="mail-text">@for (segment of segmentsOf(message.text); track $index) {@if (segment.kind === 'link') {<a data-test="mail-link" [href]="segment.href">{{ segment.href }}</a>} @else {{{ segment.text }}}}</pre>
            </details>
          } @empty {
            <p class="note" data-test="mailbox-empty">No mail yet.</p>
          }
        }
      }
    </section>
  `,
  styles: `
    .page { padding: 16px 24px 32px; max-width: 960px; }
    .heading { display: flex; align-items: center; gap: 16px; }
    h1 { flex: 1; margin: 0; font: var(--mat-sys-headline-small); }
    .message { padding: 8px 0; border-bottom: 1px solid var(--mat-sys-outline-variant); }
    summary { cursor: pointer; }
    .meta { display: block; margin-left: 16px; font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); }
    pre { white-space: pre-wrap; font: var(--mat-sys-body-small); font-family: 'JetBrains Mono', monospace; }
    .note { color: var(--mat-sys-on-surface-variant); }
    .error { color: var(--mat-sys-error); }
  `,
})
export class Mailbox {
  private readonly team = inject(TeamApi);
  private readonly refreshes = signal(0);

  protected readonly state = toSignal(toObservable(this.refreshes).pipe(switchMap(() => this.team.mailbox().pipe(toLoadState()))), {
    initialValue: { status: 'loading' } as LoadState<MailboxBody>,
  });
  protected readonly messages = computed(() => readyValue(this.state())?.items ?? []);
  protected readonly failure = computed(() => {
    const state = this.state();
    return state.status === 'failed' ? state.message : '';
  });

  protected segmentsOf(text: string): MailSegment[] {
    return mailSegments(text);
  }

  protected refresh(): void {
    this.refreshes.update((n) => n + 1);
  }
}
