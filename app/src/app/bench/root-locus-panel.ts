import { ChangeDetectionStrategy, Component, computed, input, linkedSignal, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import type { ErrorStateMatcher } from '@angular/material/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import type { LocusGain, RootLocus } from '@kinetwin/shared/frequency/root-locus';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';
import { map } from 'rxjs';
import { DEFAULT_LOCUS_TEXTS, GAIN_UNITS, type LocusField, type LocusTexts, defaultRangeText, locusRequestOf } from './root-locus-input';
import { RootLocusChart } from './root-locus-chart';
import { type RootLocusEngine, loadRootLocusEngine } from './root-locus-engine';
import { locusReadout } from './root-locus-figure';

/**
 * The root locus of the draft: its closed-loop poles in the s-plane as one gain (kp, ki or kd)
 * runs over a range, the other gains held, computed in the browser from the same characteristic
 * polynomial the closed form solves. Closed loop only. While the draft has errors the last
 * locus stays, dimmed.
 */
@Component({
  selector: 'kt-root-locus-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatFormFieldModule, MatInputModule, ReactiveFormsModule, RootLocusChart],
  host: { 'data-test': 'root-locus-panel' },
  templateUrl: './root-locus-panel.html',
  styleUrls: ['./bench-panel.css', './root-locus-panel.css'],
})
export class RootLocusPanel {
  /** The bench's draft: the stored scenario with its edits, validated; null before it loads. */
  readonly draft = input.required<Parsed<Scenario> | null>();

  protected readonly form = new FormGroup({
    gain: new FormControl<LocusGain>(DEFAULT_LOCUS_TEXTS.gain, { nonNullable: true }),
    from: new FormControl(DEFAULT_LOCUS_TEXTS.from, { nonNullable: true }),
    to: new FormControl(DEFAULT_LOCUS_TEXTS.to, { nonNullable: true }),
    points: new FormControl(DEFAULT_LOCUS_TEXTS.points, { nonNullable: true }),
    spacing: new FormControl<'linear' | 'log'>(DEFAULT_LOCUS_TEXTS.spacing, { nonNullable: true }),
  });
  private readonly texts = toSignal(this.form.valueChanges.pipe(map((): LocusTexts => this.form.getRawValue())), { initialValue: DEFAULT_LOCUS_TEXTS });
  protected readonly gainUnit = computed(() => GAIN_UNITS[this.texts().gain]);

  private readonly engine = signal<RootLocusEngine | null>(null);
  protected readonly engineFailure = signal<string | null>(null);

  /** The newest valid draft: an edit being typed keeps the last locus (dimmed). */
  private readonly scenario = linkedSignal<Parsed<Scenario> | null, Scenario | null>({
    source: this.draft,
    computation: (draft, previous) => (draft === null ? null : draft.ok ? draft.value : (previous?.value ?? null)),
  });
  protected readonly draftInvalid = computed(() => this.draft()?.ok === false);
  protected readonly openLoop = computed(() => this.scenario()?.controller.mode === 'open-loop');
  protected readonly sampled = computed(() => this.scenario()?.controller.samplePeriod ?? null);
  protected readonly defaultRange = computed(() => {
    const scenario = this.scenario();
    return scenario ? defaultRangeText(scenario, this.texts().gain) : '';
  });

  private readonly result = computed((): Parsed<RootLocus> | null => {
    const scenario = this.scenario();
    const engine = this.engine();
    if (!scenario || !engine || scenario.controller.mode !== 'pid') return null;
    const request = locusRequestOf(scenario, this.texts());
    if (!request.ok) return request;
    return engine.rootLocus(scenario, request.value);
  });
  /** The last locus computed, kept while the fields have errors. */
  protected readonly locus = linkedSignal<Parsed<RootLocus> | null, RootLocus | null>({
    source: this.result,
    computation: (result, previous) => (result?.ok ? result.value : (previous?.value ?? null)),
  });
  protected readonly readout = computed(() => {
    const locus = this.locus();
    return locus ? locusReadout(locus, this.texts().spacing) : null;
  });
  private readonly messages = computed(() => {
    const result = this.result();
    const errors: FieldError[] = result && !result.ok ? result.errors : [];
    const of = (field: LocusField) => errors.filter((e) => e.field === field).map((e) => e.message).join('; ') || null;
    return { from: of('from'), to: of('to'), points: of('points'), other: errors.filter((e) => e.field !== 'from' && e.field !== 'to' && e.field !== 'points') };
  });
  protected readonly otherErrors = computed(() => this.messages().other);
  protected readonly fieldsInvalid = computed(() => this.result()?.ok === false);
  protected readonly matchers: Record<LocusField, ErrorStateMatcher> = {
    from: { isErrorState: () => this.messages().from !== null },
    to: { isErrorState: () => this.messages().to !== null },
    points: { isErrorState: () => this.messages().points !== null },
  };

  constructor() {
    loadRootLocusEngine().then(
      (engine) => this.engine.set(engine),
      (failure: unknown) => this.engineFailure.set(`The root locus could not be loaded (${failure instanceof Error ? failure.message : String(failure)}). Reload the page to try again.`),
    );
  }

  protected message(field: LocusField): string | null {
    return this.messages()[field];
  }
}
