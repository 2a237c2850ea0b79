import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import type { ErrorStateMatcher } from '@angular/material/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { FrequencyGridRequest } from '@kinetwin/shared/frequency/frequency-grid';
import { MAX_SWEEP_POINTS_API, type SineSweepResponse } from '@kinetwin/shared/protocol/check-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';
import type { Subscription } from 'rxjs';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';
import { ChecksApi } from '../core/checks-api';
import type { FrequencyEngine } from './frequency-engine';
import { samePlainData } from './scenario-draft';
import { formatQuantity } from './scenario-facts';
import { type SweepChannelChoice, type SweepPlan, sweepDefaultsOf, sweepPlanOf } from './sweep-request';
import { type MeasuredOverlay, sweepReadout } from './sweep-readout';

/** Where the measurement is: nothing asked, a sweep in flight, its answer, or why it failed; each with its draft. */
type SweepState =
  | { kind: 'idle' }
  | { kind: 'running'; scenario: Scenario; plan: SweepPlan }
  | { kind: 'done'; scenario: Scenario; plan: SweepPlan; answer: SineSweepResponse }
  | { kind: 'failed'; scenario: Scenario; message: string; fields: FieldError[] };

/**
 * "Measure the twin": posts the draft and the frequency panel's grid (at most 40 points) to the
 * server's sine sweep and reads the measured response against the closed form at the same
 * frequencies. The panel draws `overlay()` over its Bode chart. An answer for an earlier draft
 * stays, marked stale.
 */
@Component({
  selector: 'kt-twin-sweep',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, ReactiveFormsModule],
  host: { 'data-test': 'twin-sweep' },
  templateUrl: './twin-sweep.html',
  styleUrl: './twin-sweep.css',
})
export class TwinSweep {
  private readonly checks = inject(ChecksApi);

  readonly draft = input.required<Parsed<Scenario> | null>();
  readonly grid = input.required<Parsed<FrequencyGridRequest>>();
  /** The closed form's frequency response, to compare the measured points with; null while it loads. */
  readonly engine = input<FrequencyEngine | null>(null);

  protected readonly maxPoints = MAX_SWEEP_POINTS_API;
  protected readonly channelChoice = signal<SweepChannelChoice>('default');
  /** Blank for the server's default; checked by sweepPlanOf, so the control carries no validators. */
  protected readonly amplitudeControl = new FormControl('', { nonNullable: true });
  protected readonly amplitudeText = toSignal(this.amplitudeControl.valueChanges, { initialValue: '' });
  private readonly state = signal<SweepState>({ kind: 'idle' });
  private request: Subscription | null = null;

  private readonly scenario = computed(() => {
    const draft = this.draft();
    return draft?.ok ? draft.value : null;
  });
  protected readonly closedLoop = computed(() => this.scenario()?.controller.mode === 'pid');
  protected readonly defaults = computed(() => {
    const scenario = this.scenario();
    return scenario ? sweepDefaultsOf(scenario, this.channelChoice()) : null;
  });
  /** What the button would post now, or the field errors; null while the draft or grid is invalid. */
  protected readonly plan = computed(() => {
    const scenario = this.scenario();
    const grid = this.grid();
    return scenario && grid.ok ? sweepPlanOf(scenario, grid.value, this.channelChoice(), this.amplitudeText()) : null;
  });
  protected readonly fieldError = computed(() => {
    const plan = this.plan();
    const errors = plan && !plan.ok ? plan.errors : [];
    return { channel: errors.find((e) => e.field === 'channel')?.message ?? null, amplitude: errors.find((e) => e.field === 'amplitude')?.message ?? null };
  });
  /** The amplitude field shows its error state while the plan has a message for it (it has no validators of its own). */
  protected readonly amplitudeMatcher: ErrorStateMatcher = { isErrorState: () => this.fieldError().amplitude !== null };
  protected readonly blocked = computed(() => {
    if (this.draft()?.ok === false) return 'Fix the edited fields first: the twin is measured on a valid draft.';
    if (!this.grid().ok) return 'Fix the frequency grid first: the twin is measured on it.';
    return null;
  });
  protected readonly gridText = computed(() => {
    const plan = this.plan();
    if (!plan?.ok) return null;
    const { grid, capped } = plan.value;
    const where = `${grid.points} log-spaced frequencies from ${formatQuantity(grid.from, 'rad/s')} to ${formatQuantity(grid.to, 'rad/s')}`;
    return capped ? `On ${where}: the panel's grid, capped at ${this.maxPoints} points, because each frequency is a full twin run.` : `On ${where}: the panel's grid.`;
  });
  protected readonly running = computed(() => this.state().kind === 'running');
  protected readonly canMeasure = computed(() => this.plan()?.ok === true && !this.running());
  protected readonly stale = computed(() => {
    const state = this.state();
    if (state.kind !== 'done' && state.kind !== 'failed') return false;
    const scenario = this.scenario();
    return scenario === null || !samePlainData(state.scenario, scenario);
  });
  protected readonly readout = computed(() => {
    const state = this.state();
    if (state.kind !== 'done') return null;
    const engine = this.engine();
    // The closed form on the sweep's own grid: the same log-spaced frequencies the server measured.
    const closedForm = engine ? engine.frequencyResponseOf(state.scenario, state.plan.grid) : null;
    return sweepReadout(state.answer, closedForm?.ok ? closedForm.value : null, this.stale());
  });
  /** The markers the Bode chart draws; null before any answer. */
  readonly overlay = computed((): MeasuredOverlay | null => this.readout()?.overlay ?? null);
  protected readonly failure = computed(() => {
    const state = this.state();
    return state.kind === 'failed' ? { message: state.message, fields: state.fields } : null;
  });

  constructor() {
    // Leaving the bench cancels the request; the server then stops the job and frees its worker.
    inject(DestroyRef).onDestroy(() => this.request?.unsubscribe());
  }

  protected chooseChannel(event: Event): void {
    const value = (event.target as HTMLSelectElement).value;
    if (value === 'default' || value === 'reference' || value === 'torque') this.channelChoice.set(value);
  }

  protected measure(): void {
    const scenario = this.scenario();
    const plan = this.plan();
    if (!scenario || !plan?.ok || this.running()) return;
    const chosen = plan.value;
    this.state.set({ kind: 'running', scenario, plan: chosen });
    this.request = this.checks.sineSweep(chosen.body).subscribe({
      next: (answer) => this.state.set({ kind: 'done', scenario, plan: chosen, answer }),
      error: (failure: unknown) => this.state.set({ kind: 'failed', scenario, message: apiErrorMessage(failure), fields: apiFieldErrors(failure) }),
    });
  }
}
