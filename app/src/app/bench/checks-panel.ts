import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { CheckResponse } from '@kinetwin/shared/protocol/check-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';
import type { Subscription } from 'rxjs';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';
import { ChecksApi } from '../core/checks-api';
import { checkReadout } from './check-readout';
import { samePlainData } from './scenario-draft';

/** Where the panel is: nothing asked yet, checks in flight, an answer, or a failure, each with the scenario it was for. */
type ChecksState =
  | { kind: 'idle' }
  | { kind: 'running'; scenario: Scenario }
  | { kind: 'done'; scenario: Scenario; answer: CheckResponse }
  | { kind: 'failed'; scenario: Scenario; message: string; fields: FieldError[] };

/**
 * The twin's checks of the bench's draft scenario, run on the server: the superposition and shift
 * checks (does the twin behave like a linear, time-invariant system?), the linear range (how far
 * the inputs may be scaled with the closed form still holding) and the twin against the closed
 * form. An answer for an earlier draft stays visible, marked stale.
 */
@Component({
  selector: 'kt-checks-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatIconModule, MatProgressBarModule],
  host: { 'data-test': 'checks-panel' },
  templateUrl: './checks-panel.html',
  styleUrls: ['./bench-panel.css', './checks-panel.css'],
})
export class ChecksPanel {
  private readonly checks = inject(ChecksApi);

  /** The bench's draft: the stored scenario with its edits, validated; null before it loads. */
  readonly draft = input.required<Parsed<Scenario> | null>();

  private readonly state = signal<ChecksState>({ kind: 'idle' });
  private request: Subscription | null = null;

  protected readonly running = computed(() => this.state().kind === 'running');
  protected readonly draftInvalid = computed(() => this.draft()?.ok === false);
  protected readonly canRun = computed(() => this.draft()?.ok === true && !this.running());
  protected readonly readout = computed(() => {
    const state = this.state();
    return state.kind === 'done' ? checkReadout(state.answer) : null;
  });
  protected readonly failure = computed(() => {
    const state = this.state();
    return state.kind === 'failed' ? { message: state.message, fields: state.fields } : null;
  });
  /** The answer (or failure) is for another draft than the one on the bench now. */
  protected readonly stale = computed(() => {
    const state = this.state();
    if (state.kind !== 'done' && state.kind !== 'failed') return false;
    const draft = this.draft();
    return !draft?.ok || !samePlainData(state.scenario, draft.value);
  });

  constructor() {
    // Leaving the bench cancels the request; the server then stops the job and frees its worker.
    inject(DestroyRef).onDestroy(() => this.request?.unsubscribe());
  }

  protected runChecks(): void {
    const draft = this.draft();
    if (!draft?.ok || this.running()) return;
    const scenario = draft.value;
    this.state.set({ kind: 'running', scenario });
    this.request = this.checks.run(scenario).subscribe({
      next: (answer) => this.state.set({ kind: 'done', scenario, answer }),
      error: (failure: unknown) => this.state.set({ kind: 'failed', scenario, message: apiErrorMessage(failure), fields: apiFieldErrors(failure) }),
    });
  }
}
