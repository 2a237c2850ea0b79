import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import type { SessionUser } from '@kinetwin/shared/protocol/api-types';
import { type Handoff, type HandoffAccess, MAX_HANDOFF_MESSAGE_LENGTH, type TeamMember } from '@kinetwin/shared/protocol/library-api';
import { firstValueFrom } from 'rxjs';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';
import { LibraryApi } from '../core/library-api';

/** Hands the scenario to a teammate to view or to edit, with a message; they get an e-mail. */
@Component({
  selector: 'kt-hand-off-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, MatRadioModule, MatSelectModule],
  template: `
    <section class="dialog" role="dialog" aria-modal="false" aria-labelledby="hand-off-heading" data-test="hand-off-dialog">
      <h3 id="hand-off-heading">Hand off “{{ scenarioName() }}”</h3>
      <mat-form-field appearance="outline" class="wide" subscriptSizing="dynamic">
        <mat-label>Teammate</mat-label>
        <mat-select data-test="hand-off-to" [value]="toUserId()" (valueChange)="toUserId.set($event)">
          @for (member of teammates(); track member.id) {
            <mat-option [value]="member.id" [attr.data-test]="'hand-off-to-' + member.id">{{ member.displayName }} ({{ member.role }})</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <mat-radio-group aria-label="Access" [value]="access()" (change)="access.set($event.value)">
        <mat-radio-button value="view" data-test="hand-off-view">To view and comment</mat-radio-button>
        <mat-radio-button value="edit" data-test="hand-off-edit" [disabled]="!canHandOffEdit() || recipientIsViewer()">To edit</mat-radio-button>
      </mat-radio-group>
      <mat-form-field appearance="outline" class="wide" subscriptSizing="dynamic">
        <mat-label>Message</mat-label>
        <textarea matInput rows="3" data-test="hand-off-message" [maxLength]="maxMessage" [value]="message()" (input)="message.set($any($event.target).value)"></textarea>
      </mat-form-field>
      @if (failure(); as text) {
        <p class="error" role="alert" data-test="hand-off-error">{{ text }}</p>
      }
      <div class="actions">
        <button mat-flat-button type="button" data-test="confirm-hand-off" [disabled]="toUserId() === null || busy()" (click)="handOff()">
          {{ busy() ? 'Handing off…' : 'Hand off' }}
        </button>
        <button mat-button type="button" data-test="cancel-hand-off" (click)="closed.emit()">Cancel</button>
      </div>
    </section>
  `,
  styleUrl: './scenario-dialog.css',
})
export class HandOffDialog {
  private readonly library = inject(LibraryApi);

  readonly scenarioId = input.required<number>();
  readonly scenarioName = input.required<string>();
  readonly members = input.required<readonly TeamMember[]>();
  readonly me = input.required<SessionUser | null>();
  /** Only the owner or an admin may hand off for editing. */
  readonly canHandOffEdit = input(false);
  readonly handedOff = output<Handoff>();
  readonly closed = output<void>();

  protected readonly maxMessage = MAX_HANDOFF_MESSAGE_LENGTH;
  protected readonly toUserId = signal<number | null>(null);
  protected readonly access = signal<HandoffAccess>('view');
  protected readonly message = signal('');
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);

  protected readonly teammates = computed(() => this.members().filter((member) => member.id !== this.me()?.id));
  protected readonly recipientIsViewer = computed(() => this.members().find((member) => member.id === this.toUserId())?.role === 'viewer');

  protected async handOff(): Promise<void> {
    const toUserId = this.toUserId();
    if (toUserId === null || this.busy()) return;
    // A viewer cannot edit: fall back to view rather than send what the server refuses.
    const access = this.recipientIsViewer() ? 'view' : this.access();
    this.busy.set(true);
    this.failure.set(null);
    try {
      this.handedOff.emit(await firstValueFrom(this.library.handOff(this.scenarioId(), { toUserId, access, message: this.message().trim() })));
    } catch (failure) {
      const fields = apiFieldErrors(failure);
      this.failure.set(fields.length ? `${apiErrorMessage(failure)} ${fields.map((f) => f.message).join('; ')}` : apiErrorMessage(failure));
    } finally {
      this.busy.set(false);
    }
  }
}
