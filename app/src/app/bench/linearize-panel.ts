import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, linkedSignal, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import type { ErrorStateMatcher } from '@angular/material/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { type HoldingMode, linearizeAbout } from '@kinetwin/shared/linearize/operating-point';
import type { OperatingRangeResponse } from '@kinetwin/shared/protocol/check-api';
import { type LibraryDetail, SAFETY_CAUTION } from '@kinetwin/shared/protocol/library-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';
import { type Subscription, firstValueFrom, map } from 'rxjs';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';
import { ChecksApi } from '../core/checks-api';
import { LibraryApi } from '../core/library-api';
import { Session } from '../core/session';
import { type AngleUnit, DEFAULT_LINEARIZE_TEXTS, type LinearizeField, type LinearizeRequest, type LinearizeTexts, linearizeRequestOf } from './linearize-input';
import { linearModelReadout, operatingRangeText } from './linearize-readout';
import { samePlainData } from './scenario-draft';

/** The operating range: not asked, in flight, answered or failed; each with the draft and request it was for. */
type RangeState =
  | { kind: 'idle' }
  | { kind: 'running'; scenario: Scenario; request: LinearizeRequest }
  | { kind: 'done'; scenario: Scenario; request: LinearizeRequest; answer: OperatingRangeResponse }
  | { kind: 'failed'; scenario: Scenario; request: LinearizeRequest; message: string; fields: FieldError[] };

type SaveState = { kind: 'idle' } | { kind: 'saving' } | { kind: 'saved'; detail: LibraryDetail } | { kind: 'failed'; message: string };

/**
 * A gravity-loaded joint linearized about an operating angle θ0: the effective stiffness, the
 * holding torque and the notes at once in the browser (shared/linearize, pure), how large a move
 * the linear model still describes (the operating range, on the server), and the linear model
 * saved as a new library scenario. Shown only while the draft has a gravity load.
 */
@Component({
  selector: 'kt-linearize-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, ReactiveFormsModule, RouterLink],
  host: { 'data-test': 'linearize-panel', '[class.absent]': 'scenario() === null' },
  templateUrl: './linearize-panel.html',
  styleUrls: ['./bench-panel.css', './linearize-panel.css'],
})
export class LinearizePanel {
  private readonly checks = inject(ChecksApi);
  private readonly library = inject(LibraryApi);
  private readonly session = inject(Session);

  /** The bench's draft: the stored scenario with its edits, validated; null before it loads. */
  readonly draft = input.required<Parsed<Scenario> | null>();
  /** Tags the saved linear model takes over from the scenario on the bench. */
  readonly tags = input<readonly string[]>([]);

  protected readonly form = new FormGroup({
    angle: new FormControl(DEFAULT_LINEARIZE_TEXTS.angle, { nonNullable: true }),
    unit: new FormControl<AngleUnit>(DEFAULT_LINEARIZE_TEXTS.unit, { nonNullable: true }),
    holding: new FormControl<HoldingMode>(DEFAULT_LINEARIZE_TEXTS.holding, { nonNullable: true }),
    tolerancePercent: new FormControl(DEFAULT_LINEARIZE_TEXTS.tolerancePercent, { nonNullable: true }),
  });
  private readonly texts = toSignal(this.form.valueChanges.pipe(map((): LinearizeTexts => this.form.getRawValue())), { initialValue: DEFAULT_LINEARIZE_TEXTS });
  private readonly request = computed(() => linearizeRequestOf(this.texts()));

  /** The newest valid draft with a gravity load: an edit being typed keeps the panel (dimmed) instead of hiding it. */
  private readonly lastValid = linkedSignal<Parsed<Scenario> | null, Scenario | null>({
    source: this.draft,
    computation: (draft, previous) => (draft === null ? null : draft.ok ? draft.value : (previous?.value ?? null)),
  });
  protected readonly scenario = computed(() => {
    const scenario = this.lastValid();
    return scenario?.nonlinear?.gravity ? scenario : null;
  });
  protected readonly draftInvalid = computed(() => this.draft()?.ok === false);

  /** The linear model about θ0, or the field errors of the request or of linearizeAbout. */
  protected readonly linearized = computed(() => {
    const scenario = this.scenario();
    const request = this.request();
    if (!scenario) return null;
    if (!request.ok) return request;
    return linearizeAbout(scenario, { angle: request.value.angle, holding: request.value.holding });
  });
  protected readonly model = computed(() => {
    const linearized = this.linearized();
    return linearized?.ok ? linearModelReadout(linearized.value, this.texts().holding === 'feed-forward') : null;
  });
  private readonly messages = computed(() => {
    const linearized = this.linearized();
    const errors = linearized && !linearized.ok ? linearized.errors : [];
    const of = (field: LinearizeField) => errors.filter((e) => e.field === field).map((e) => e.message).join('; ') || null;
    const other = errors.filter((e) => e.field !== 'angle' && e.field !== 'tolerance');
    return { angle: of('angle'), tolerance: of('tolerance'), other };
  });
  protected readonly otherErrors = computed(() => this.messages().other);
  protected readonly matchers: Record<LinearizeField, ErrorStateMatcher> = {
    angle: { isErrorState: () => this.messages().angle !== null },
    tolerance: { isErrorState: () => this.messages().tolerance !== null },
  };

  private readonly range = signal<RangeState>({ kind: 'idle' });
  private rangeRequest: Subscription | null = null;
  protected readonly ranging = computed(() => this.range().kind === 'running');
  protected readonly canRange = computed(() => this.linearized()?.ok === true && !this.draftInvalid() && !this.ranging());
  protected readonly rangeReadout = computed(() => {
    const state = this.range();
    return state.kind === 'done' ? operatingRangeText(state.answer) : null;
  });
  protected readonly rangeFailure = computed(() => {
    const state = this.range();
    return state.kind === 'failed' ? { message: state.message, fields: state.fields } : null;
  });
  /** The range (or its failure) is for another draft, angle, holding or tolerance than the form shows now. */
  protected readonly rangeStale = computed(() => {
    const state = this.range();
    if (state.kind !== 'done' && state.kind !== 'failed') return false;
    const draft = this.draft();
    const request = this.request();
    return !draft?.ok || !request.ok || !samePlainData(state.scenario, draft.value) || !samePlainData(state.request, request.value);
  });

  protected readonly save = signal<SaveState>({ kind: 'idle' });
  protected readonly saved = computed(() => {
    const state = this.save();
    return state.kind === 'saved' ? state.detail : null;
  });
  protected readonly saveFailure = computed(() => {
    const state = this.save();
    return state.kind === 'failed' ? state.message : null;
  });
  protected readonly canCreate = computed(() => {
    const role = this.session.user()?.role;
    return role !== undefined && role !== 'viewer';
  });
  protected readonly canSave = computed(() => this.canCreate() && this.linearized()?.ok === true && !this.draftInvalid() && this.save().kind !== 'saving');
  protected readonly caution = SAFETY_CAUTION;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.rangeRequest?.unsubscribe());
  }

  protected message(field: LinearizeField): string | null {
    return this.messages()[field];
  }

  protected findRange(): void {
    const draft = this.draft();
    const request = this.request();
    if (!draft?.ok || !request.ok || !this.canRange()) return;
    const scenario = draft.value;
    const asked = request.value;
    this.range.set({ kind: 'running', scenario, request: asked });
    this.rangeRequest = this.checks.operatingRange({ scenario, ...asked }).subscribe({
      next: (answer) => this.range.set({ kind: 'done', scenario, request: asked, answer }),
      error: (failure: unknown) => this.range.set({ kind: 'failed', scenario, request: asked, message: apiErrorMessage(failure), fields: apiFieldErrors(failure) }),
    });
  }

  /** Creates the linear model as a new library scenario; the scenario on the bench is left as it is. */
  protected async saveAsNew(): Promise<void> {
    const linearized = this.linearized();
    if (!linearized?.ok || !this.canSave()) return;
    const linear = linearized.value.linear;
    this.save.set({ kind: 'saving' });
    try {
      const { angle, unit, holding } = this.texts();
      const note = `Linear model about θ0 = ${angle.trim()}${unit === 'deg' ? '°' : ' rad'} (holding torque: ${holding}), made on the bench`;
      const detail = await firstValueFrom(this.library.create({ scenario: linear, note, tags: [...this.tags()] }));
      this.save.set({ kind: 'saved', detail });
    } catch (failure) {
      const fields = apiFieldErrors(failure);
      this.save.set({ kind: 'failed', message: fields.length ? `${apiErrorMessage(failure)} ${fields.map((f) => `${f.field}: ${f.message}`).join('; ')}` : apiErrorMessage(failure) });
    }
  }
}
