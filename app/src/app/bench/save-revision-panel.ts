import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { type LibraryDetail, MAX_REVISION_NOTE_LENGTH } from '@kinetwin/shared/protocol/library-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import { RevisionSaveFlow } from '../revision-save/revision-save-flow';
import { StaleSaveNotice } from '../revision-save/stale-save-notice';

/**
 * Saves the bench's edited scenario as a new revision on top of the one it loaded. When someone
 * saved in between (409, both versions in the answer), it offers to save the edit as a copy or
 * to load their revision (RevisionSaveFlow, as on the scenario page); nothing is lost either way.
 * Only those who may edit see the save controls.
 */
@Component({
  selector: 'kt-save-revision-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  providers: [RevisionSaveFlow],
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, RouterLink, StaleSaveNotice],
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
      @if (flow.stale(); as conflict) {
        <kt-stale-save-notice [conflict]="conflict" [busy]="flow.busy()" (copy)="saveAsCopy()" (reload)="reloadTheirs()" />
      }
      <a mat-button data-test="open-scenario-page" [routerLink]="['/library', detail().id]">Revisions, review and sign-off</a>
    </section>
  `,
  styles: `
    .save { display: flex; flex-direction: column; align-items: flex-start; gap: 6px; }
    .note { width: 100%; }
    .hint { margin: 0; font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); }
    .error { margin: 0; color: var(--mat-sys-error); }
  `,
})
export class SaveRevisionPanel {
  protected readonly flow = inject(RevisionSaveFlow);

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
  protected readonly busy = this.flow.busy;
  protected readonly done = this.flow.done;
  /** The server's words, with the fields it named (the bench's form shows only its own checks). */
  protected readonly failure = computed(() => {
    const text = this.flow.failure();
    const fields = this.flow.fieldErrors();
    return text !== null && fields.length ? `${text} ${fields.map((f) => `${f.field}: ${f.message}`).join('; ')}` : text;
  });

  // Tolerates a detail without `access` (an older server answer): then nothing is editable.
  protected readonly canEdit = computed(() => this.detail().access?.edit === true);
  protected readonly canSave = computed(() => this.canEdit() && this.changed() && this.edited()?.ok === true && !this.busy() && this.flow.stale() === null);

  protected async saveRevision(): Promise<void> {
    const edited = this.edited();
    if (!edited?.ok || !this.canSave()) return;
    const detail = this.detail();
    const saved = await this.flow.save({ scenarioId: detail.id, scenario: edited.value, note: this.note(), baseRevision: detail.revision });
    if (!saved) return;
    this.note.set('');
    this.replaced.emit(saved);
  }

  protected async saveAsCopy(): Promise<void> {
    const created = await this.flow.saveAsCopy(this.detail().tags ?? []);
    if (created) this.copied.emit(created);
  }

  protected async reloadTheirs(): Promise<void> {
    const theirs = await this.flow.loadTheirs(this.detail().id);
    if (theirs) this.replaced.emit(theirs);
  }
}
