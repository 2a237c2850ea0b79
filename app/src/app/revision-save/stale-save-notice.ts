import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import type { StaleSaveBody } from '@kinetwin/shared/protocol/library-api';

/**
 * What a refused save (409) offers, in the same words wherever an edit is saved: keep mine as a
 * copy, put my edits on their revision (where the editor can), or drop mine and load theirs.
 */
@Component({
  selector: 'kt-stale-save-notice',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule],
  template: `
    <section data-test="stale-save" class="stale" role="alertdialog" aria-labelledby="stale-heading">
      <h3 id="stale-heading">Someone saved first</h3>
      <p>
        {{ conflict().current.author.displayName }} saved revision {{ conflict().current.number }}
        @if (conflict().current.note) {
          (“{{ conflict().current.note }}”)
        }
        after revision {{ conflict().yours.baseRevision }}, which your edit started from. Nothing was saved and nothing is lost: choose what to do with your edit.
      </p>
      <div class="actions">
        <button mat-flat-button type="button" data-test="save-as-copy" [disabled]="busy()" (click)="copy.emit()">Save mine as a copy</button>
        @if (canMerge()) {
          <button mat-stroked-button type="button" data-test="merge-onto-theirs" [disabled]="busy()" (click)="merge.emit()">Put my edits on revision {{ conflict().current.number }}</button>
        }
        <button mat-button type="button" data-test="reload-theirs" [disabled]="busy()" (click)="reload.emit()">Drop mine, load revision {{ conflict().current.number }}</button>
      </div>
    </section>
  `,
  styles: `
    .stale { margin-top: 8px; padding: 12px 16px; border-radius: 12px; background: var(--mat-sys-error-container); color: var(--mat-sys-on-error-container); }
    .stale h3 { margin: 0 0 4px; font: var(--mat-sys-title-small); }
    .stale p { margin: 0 0 6px; }
    .actions { display: flex; flex-wrap: wrap; align-items: center; gap: 8px; }
  `,
})
export class StaleSaveNotice {
  readonly conflict = input.required<StaleSaveBody>();
  readonly busy = input(false);
  /** Whether the editor can move the edit onto the newer revision (the bench's field draft cannot yet). */
  readonly canMerge = input(false);
  readonly copy = output<void>();
  readonly merge = output<void>();
  readonly reload = output<void>();
}
