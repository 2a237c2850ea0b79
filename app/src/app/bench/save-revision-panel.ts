import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { type LibraryDetail, MAX_REVISION_NOTE_LENGTH, type StaleSaveBody } from '@kinetwin/shared/protocol/library-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import { firstValueFrom } from 'rxjs';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';
import { LibraryApi } from '../core/library-api';
import { copyName, staleSaveOf } from '../scenario/stale-save';

/**
 * Saves the bench's edited scenario as a new revision on top of the one it loaded. When someone
 * saved in between (409, both versions in the answer), it offers to save the edit as a copy or
 * to load their revision; nothing is lost either way. Only shown save controls to those who may edit.
 */
@Component({
  selector: 'kt-save-revision-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, RouterLink],
  template: `
    <section class="save" aria-label="Save a revision">
      @if (canEdit()) {
        <mat-form-field appearance="outline" subscriptSizing="dynamic" class="note">
          <mat-label>Revision note</mat-label>
          <input matInput data-test="revision-note" [maxLength]="maxNote" [value]="note()" (input)="note.set($any($event.target).value)" />
        </mat-form-field>
        <button mat-flat-button type="button" data-test="save-revision" [disabled]="!canSave()" (click)="saveRevision()">
          <mat-icon>save</mat-icon>
          {{ busy() ? 'Saving…' : 'Save revision' }}
        </button>
        <p class="hint">Saves the edited fields as revision {{ detail().revision + 1 }}, on top of revision {{ detail().revision }}.</p>
      }
      @if (done(); as text) {
        <p data-test="save-done" class="hint" role="status">{{ text }}</p>
      }
      @if (failure(); as text) {
        <p data-test="save-error" class="error" role="alert">{{ text }}</p>
      }
      @if (stale(); as conflict) {
        <div data-test="stale-save" class="stale" role="alertdialog" aria-label="Someone saved first">
          <p>
            {{ conflict.current.author.displayName }} saved revision {{ conflict.current.number }} after revision {{ conflict.yours.baseRevision }}, which your edit started
            from. Nothing was saved and nothing is lost.
          </p>
          <button mat-flat-button type="button" data-test="save-as-copy" [disabled]="busy()" (click)="saveAsCopy()">Save mine as a copy</button>
          <button mat-button type="button" data-test="reload-theirs" [disabled]="busy()" (click)="reloadTheirs()">Drop mine, load revision {{ conflict.current.number }}</button>
        </div>
      }
      <a mat-button data-test="open-scenario-page" [routerLink]="['/library', detail().id]">Revisions, review and sign-off</a>
    </section>
  `,
  styles: `
    .save { display: flex; flex-direction: column; align-items: flex-start; gap: 6px; }
    .note { width: 100%; }
    .hint { margin: 0; font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); }
    .error { margin: 0; color: var(--mat-sys-error); }
    .stale { padding: 8px 12px; border-radius: 12px; background: var(--mat-sys-error-container); color: var(--mat-sys-on-error-container); }
    .stale p { margin: 0 0 6px; }
  `,
})
export class SaveRevisionPanel {
  private readonly library = inject(LibraryApi);

  /** The scenario as loaded (GET /api/scenarios/:id answers with the library detail). */
  readonly detail = input.required<LibraryDetail>();
  /** The bench's edited scenario, validated; null before it loads. */
  readonly edited = input.required<Parsed<Scenario> | null>();
  /** Whether any field was edited. */
  readonly changed = input(false);
  /** A newer revision of this scenario to show: after a save, or their revision after a conflict. */
  readonly replaced = output<LibraryDetail>();
  /** The edit went into a new scenario. */
  readonly copied = output<LibraryDetail>();

  protected readonly maxNote = MAX_REVISION_NOTE_LENGTH;
  protected readonly note = signal('');
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);
  protected readonly done = signal<string | null>(null);
  protected readonly stale = signal<StaleSaveBody | null>(null);

  // Tolerates a detail without `access` (an older server answer): then nothing is editable.
  protected readonly canEdit = computed(() => this.detail().access?.edit === true);
  protected readonly canSave = computed(() => this.canEdit() && this.changed() && this.edited()?.ok === true && !this.busy() && this.stale() === null);

  protected async saveRevision(): Promise<void> {
    const edited = this.edited();
    if (!edited?.ok || !this.canSave()) return;
    const detail = this.detail();
    this.busy.set(true);
    this.failure.set(null);
    this.done.set(null);
    try {
      const saved = await firstValueFrom(this.library.save(detail.id, { scenario: edited.value, note: this.note().trim(), baseRevision: detail.revision }));
      this.note.set('');
      this.done.set(`Saved as revision ${saved.revision}.`);
      this.replaced.emit(saved);
    } catch (failure) {
      const stale = staleSaveOf(failure);
      if (stale) {
        this.stale.set(stale);
      } else {
        const fields = apiFieldErrors(failure);
        this.failure.set(fields.length ? `${apiErrorMessage(failure)} ${fields.map((f) => `${f.field}: ${f.message}`).join('; ')}` : apiErrorMessage(failure));
      }
    } finally {
      this.busy.set(false);
    }
  }

  protected async saveAsCopy(): Promise<void> {
    const stale = this.stale();
    if (!stale) return;
    await this.run(async () => {
      const mine = stale.yours.scenario;
      const note = stale.yours.note || `Copy of an edit of revision ${stale.yours.baseRevision}, saved after revision ${stale.current.number} came in`;
      const created = await firstValueFrom(this.library.create({ scenario: { ...mine, name: copyName(mine.name) }, note, tags: this.detail().tags ?? [] }));
      this.stale.set(null);
      this.copied.emit(created);
    });
  }

  protected async reloadTheirs(): Promise<void> {
    await this.run(async () => {
      const theirs = await firstValueFrom(this.library.get(this.detail().id));
      this.stale.set(null);
      this.done.set(`Showing revision ${theirs.revision}; your edit was dropped.`);
      this.replaced.emit(theirs);
    });
  }

  private async run(action: () => Promise<void>): Promise<void> {
    this.busy.set(true);
    this.failure.set(null);
    try {
      await action();
    } catch (failure) {
      this.failure.set(apiErrorMessage(failure));
    } finally {
      this.busy.set(false);
    }
  }
}
