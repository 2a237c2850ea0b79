import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal, untracked, viewChild } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import type { ErrorStateMatcher } from '@angular/material/core';
import type { FrequencyGridRequest } from '@kinetwin/shared/frequency/frequency-grid';
import type { FrequencyResponse } from '@kinetwin/shared/frequency/frequency-response';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import { map } from 'rxjs';
import { BodeChart } from './bode-chart';
import { type FrequencyEngine, loadFrequencyEngine } from './frequency-engine';
import { DEFAULT_GRID_TEXTS, type GridField, type GridTexts, gridRequestOf } from './frequency-grid-input';
import { frequencyReadout } from './frequency-readout';
import { samePlainData } from './scenario-draft';
import { TwinSweep } from './twin-sweep';

/** A valid draft on a valid grid: what one frequency response is computed for. */
interface FrequencyRequest {
  scenario: Scenario;
  grid: FrequencyGridRequest;
}

/** The last computation: its request and the response, or why there is none. */
type FrequencyResult = { kind: 'none' } | { kind: 'computed'; request: FrequencyRequest; response: FrequencyResponse } | { kind: 'failed'; request: FrequencyRequest; message: string };

/**
 * Puts a grid field in Material's error state while the panel has a message for it. The rule is
 * gridRequestOf's, over all three fields at once (`to` must be above `from`), so the controls
 * carry no validators of their own.
 */
class MessageErrorMatcher implements ErrorStateMatcher {
  constructor(private readonly message: () => string | null) {}
  isErrorState(): boolean {
    return this.message() !== null;
  }
}

/**
 * The frequency response of the bench's draft scenario, from the closed form in the browser:
 * the Bode chart of the loop, reference → angle and torque → angle, the margins, bandwidth,
 * stability verdict and notes, on a grid the user sets. The draft may change on every
 * keystroke; the response is recomputed at most once per animation frame, for the newest draft.
 * While the draft or the grid is invalid the last response stays, dimmed, with the reason. Below
 * the chart the twin itself can be measured on the same grid (on the server), its points drawn
 * over the curves.
 */
@Component({
  selector: 'kt-frequency-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [BodeChart, MatFormFieldModule, MatInputModule, ReactiveFormsModule, TwinSweep],
  host: { 'data-test': 'frequency-panel' },
  templateUrl: './frequency-panel.html',
  styleUrls: ['./bench-panel.css', './frequency-panel.css'],
})
export class FrequencyPanel {
  /** The bench's draft: the stored scenario with its edits, validated; null before it loads. */
  readonly draft = input.required<Parsed<Scenario> | null>();

  protected readonly gridForm = new FormGroup({
    from: new FormControl(DEFAULT_GRID_TEXTS.from, { nonNullable: true }),
    to: new FormControl(DEFAULT_GRID_TEXTS.to, { nonNullable: true }),
    points: new FormControl(DEFAULT_GRID_TEXTS.points, { nonNullable: true }),
  });
  private readonly gridTexts = toSignal(this.gridForm.valueChanges.pipe(map((): GridTexts => this.gridForm.getRawValue())), { initialValue: DEFAULT_GRID_TEXTS });
  protected readonly grid = computed(() => gridRequestOf(this.gridTexts()));
  private readonly gridMessages = computed(() => {
    const grid = this.grid();
    const messages: Record<GridField, string | null> = { from: null, to: null, points: null };
    if (grid.ok) return messages;
    for (const error of grid.errors) {
      const field = error.field as GridField;
      messages[field] = messages[field] === null ? error.message : `${messages[field]}; ${error.message}`;
    }
    return messages;
  });
  protected readonly matchers: Record<GridField, ErrorStateMatcher> = {
    from: new MessageErrorMatcher(() => this.gridMessages().from),
    to: new MessageErrorMatcher(() => this.gridMessages().to),
    points: new MessageErrorMatcher(() => this.gridMessages().points),
  };

  protected readonly engine = signal<FrequencyEngine | null>(null);
  private readonly engineFailureText = signal<string | null>(null);
  protected readonly engineFailure = this.engineFailureText.asReadonly();

  /** What to compute now; null while the draft or the grid is invalid. */
  private readonly request = computed((): FrequencyRequest | null => {
    const draft = this.draft();
    const grid = this.grid();
    return draft?.ok && grid.ok ? { scenario: draft.value, grid: grid.value } : null;
  });
  private readonly result = signal<FrequencyResult>({ kind: 'none' });

  protected readonly response = computed(() => {
    const result = this.result();
    return result.kind === 'computed' ? result.response : null;
  });
  protected readonly readout = computed(() => {
    const response = this.response();
    return response ? frequencyReadout(response) : null;
  });
  protected readonly failure = computed(() => {
    const result = this.result();
    return result.kind === 'failed' ? result.message : null;
  });
  /** Why the shown response is not the draft's: the draft or the grid has errors. */
  protected readonly blocked = computed(() => {
    if (this.draft()?.ok === false) return 'The edited scenario has errors: the response shown is of the last valid draft.';
    if (!this.grid().ok) return 'Fix the frequency grid: the response shown is for the last valid grid.';
    return null;
  });
  private readonly sweep = viewChild(TwinSweep);
  /** The twin's measured points, drawn over the closed form's curves. */
  protected readonly measured = computed(() => this.sweep()?.overlay() ?? null);
  protected readonly loading = computed(() => this.result().kind === 'none' && this.engineFailure() === null && this.request() !== null);

  private frame: number | null = null;

  constructor() {
    loadFrequencyEngine().then(
      (engine) => this.engine.set(engine),
      (failure: unknown) =>
        this.engineFailureText.set(`The frequency response could not be loaded (${failure instanceof Error ? failure.message : String(failure)}). Reload the page to try again.`),
    );

    effect(() => {
      this.request();
      this.engine();
      untracked(() => this.scheduleCompute());
    });

    inject(DestroyRef).onDestroy(() => {
      if (this.frame !== null) cancelAnimationFrame(this.frame);
    });
  }

  protected message(field: GridField): string | null {
    return this.gridMessages()[field];
  }

  /** One computation per frame, whatever the typing rate: the frame takes the newest request. */
  private scheduleCompute(): void {
    if (this.frame !== null) return;
    this.frame = requestAnimationFrame(() => {
      this.frame = null;
      this.compute();
    });
  }

  private compute(): void {
    const engine = this.engine();
    const request = this.request();
    if (!engine || !request) return;
    const last = this.result();
    // The same draft again (an edit typed back, the same revision reloaded) needs no new computation.
    if (last.kind !== 'none' && samePlainData(last.request, request)) return;
    try {
      const computed = engine.frequencyResponseOf(request.scenario, request.grid);
      this.result.set(
        computed.ok
          ? { kind: 'computed', request, response: computed.value }
          : { kind: 'failed', request, message: `The frequency response was refused: ${computed.errors.map((error) => `${error.field}: ${error.message}`).join('; ')}` },
      );
    } catch (failure) {
      this.result.set({ kind: 'failed', request, message: `The frequency response could not be computed: ${failure instanceof Error ? failure.message : String(failure)}` });
    }
  }
}
