import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { RevisionDetail, RevisionDiff } from '@kinetwin/shared/protocol/library-api';
import { diffSectionRows } from './diff-rows';
import { TraceOverlay } from './trace-overlay';

/** Two revisions side by side: the parameters that differ, section by section, and their closed-form traces. */
@Component({
  selector: 'kt-revision-diff-view',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [TraceOverlay],
  template: `
    <section data-test="revision-diff" aria-label="Parameter diff">
      <h3>Revision {{ diff().from.number }} → revision {{ diff().to.number }}</h3>
      @if (sections().length === 0) {
        <p class="note" data-test="diff-empty">The two revisions have the same parameters.</p>
      } @else {
        <table class="diff">
          <thead>
            <tr>
              <th scope="col">Parameter</th>
              <th scope="col">Revision {{ diff().from.number }}</th>
              <th scope="col">Revision {{ diff().to.number }}</th>
              <th scope="col">Unit</th>
            </tr>
          </thead>
          @for (group of sections(); track group.section) {
            <tbody>
              <tr>
                <th colspan="4" scope="rowgroup" class="section">{{ group.label }}</th>
              </tr>
              @for (row of group.rows; track row.path) {
                <tr data-test="diff-row" [attr.data-path]="row.path" [class]="row.kind">
                  <td>{{ row.label }}</td>
                  <td class="numeric before">{{ row.before }}</td>
                  <td class="numeric after">{{ row.after }}</td>
                  <td class="unit">{{ row.unit }}</td>
                </tr>
              }
            </tbody>
          }
        </table>
      }
      @if (fromScenario() && toScenario()) {
        <kt-trace-overlay [from]="fromScenario()!.scenario" [to]="toScenario()!.scenario" [fromLabel]="diff().from.number" [toLabel]="diff().to.number" />
      }
    </section>
  `,
  styles: `
    h3 { margin: 8px 0; font: var(--mat-sys-title-small); }
    .diff { border-collapse: collapse; width: 100%; max-width: 760px; }
    th, td { padding: 4px 8px; text-align: left; border-bottom: 1px solid var(--mat-sys-outline-variant); }
    .section { background: var(--mat-sys-surface-container); font: var(--mat-sys-label-large); }
    .numeric { font-family: 'JetBrains Mono', monospace; }
    .added .after, .changed .after { color: var(--mat-sys-primary); }
    .removed .before, .changed .before { text-decoration: line-through; color: var(--mat-sys-on-surface-variant); }
    .unit { color: var(--mat-sys-on-surface-variant); }
    .note { color: var(--mat-sys-on-surface-variant); }
  `,
})
export class RevisionDiffView {
  readonly diff = input.required<RevisionDiff>();
  /** The two revisions' documents, for the overlay; null while they load. */
  readonly fromScenario = input<RevisionDetail | null>(null);
  readonly toScenario = input<RevisionDetail | null>(null);

  protected readonly sections = computed(() => diffSectionRows(this.diff().changes));
}
