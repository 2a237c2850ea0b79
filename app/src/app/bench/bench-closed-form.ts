import { Injectable, computed, inject, linkedSignal, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { withAppendedTerms } from '@kinetwin/shared/twin/kick-rule';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import { debounceTime } from 'rxjs';
import { BenchDraft } from './bench-draft';
import { BenchLiveRun } from './bench-live-run';
import { type ClosedFormEngine, loadClosedFormEngine } from './closed-form-engine';
import { type ClosedFormTrace, type ClosedFormView, closedFormView } from './closed-form-view';

/** Quiet time after the last keystroke before the closed form is solved again, ms. */
export const CLOSED_FORM_DEBOUNCE_MS = 150;

/**
 * The bench's closed-form solve: the engine loaded on first use, the draft solved once typing
 * pauses, with the live run's kicks appended (by superposition, the closed form of the whole
 * run). Provided by the bench component.
 */
@Injectable()
export class BenchClosedForm {
  private readonly draft = inject(BenchDraft);
  private readonly run = inject(BenchLiveRun);

  private readonly engine = signal<ClosedFormEngine | null>(null);
  private readonly engineFailure = signal<string | null>(null);
  /** The draft once typing pauses: what the closed form is solved for. */
  private readonly settled = toSignal(toObservable(this.draft.edited).pipe(debounceTime(CLOSED_FORM_DEBOUNCE_MS)), { initialValue: null });

  readonly view = computed((): ClosedFormView => {
    const failure = this.engineFailure();
    if (failure !== null) return { kind: 'failed', message: failure };
    const settled = this.settled();
    if (!settled) return { kind: 'loading' };
    const whole: Parsed<Scenario> = settled.ok ? withAppendedTerms(settled.value, this.run.kickTerms()) : settled;
    return closedFormView(this.engine(), whole);
  });
  /**
   * The trace on the chart: the newest solved one. While the draft has an error the last valid
   * draft's trace stays, with `note` saying so, instead of the chart going blank.
   */
  readonly trace = linkedSignal<ClosedFormView, ClosedFormTrace | null>({
    source: this.view,
    computation: (view, previous) => (view.kind === 'solved' ? view.trace : view.kind === 'invalid' ? (previous?.value ?? null) : null),
  });
  /** Why the chart's closed form is missing or from an earlier draft; null while it is current. */
  readonly note = computed((): string | null => {
    const view = this.view();
    if (view.kind === 'failed') return `No closed form on the chart: ${view.message}`;
    if (view.kind !== 'invalid') return null;
    const first = view.errors[0];
    const what = first ? `${first.field ? `${first.field}: ` : ''}${first.message}` : 'the draft is not valid';
    return this.trace() ? `The draft has an error (${what}); the chart keeps the last valid closed form.` : `No closed form on the chart: the draft has an error (${what}).`;
  });

  constructor() {
    loadClosedFormEngine().then(
      (engine) => this.engine.set(engine),
      (failure: unknown) => this.engineFailure.set(`The closed-form engine could not be loaded (${failure instanceof Error ? failure.message : String(failure)}). Reload the page to try again.`),
    );
  }
}
