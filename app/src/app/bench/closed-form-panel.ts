import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { closedFormReadout } from './closed-form-readout';
import type { ClosedFormView } from './closed-form-view';
import { KatexExpression } from './katex-expression';

/**
 * The closed form of the bench's current scenario: the angle response typeset, poles and
 * stability, DC gain, the final and initial value theorems, step metrics against the scenario's
 * limits, the dominant pair with its textbook estimates, and the engine's notes.
 */
@Component({
  selector: 'kt-closed-form-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [KatexExpression],
  host: { 'data-test': 'closed-form-panel' },
  templateUrl: './closed-form-panel.html',
  styleUrls: ['./bench-panel.css', './closed-form-panel.css'],
})
export class ClosedFormPanel {
  readonly view = input.required<ClosedFormView>();

  protected readonly solved = computed(() => {
    const view = this.view();
    return view.kind === 'solved' ? view : null;
  });
  protected readonly readout = computed(() => {
    const solved = this.solved();
    return solved ? closedFormReadout(solved.solution, solved.scenario) : null;
  });
  protected readonly errors = computed(() => {
    const view = this.view();
    return view.kind === 'invalid' ? view.errors : [];
  });
  protected readonly failure = computed(() => {
    const view = this.view();
    return view.kind === 'failed' ? view.message : '';
  });
}
