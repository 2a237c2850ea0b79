import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Title } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import type { LibraryDetail } from '@kinetwin/shared/protocol/library-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError } from '@kinetwin/shared/validation/field-errors';
import { catchError, debounceTime, map, of, startWith, switchMap } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import type { LoadState } from '../core/load-state';
import { type RunEvent, type RunLink, RunSocket } from '../core/run-socket';
import { ScenarioApi } from '../core/scenario-api';
import { AngleChart } from './angle-chart';
import { type ChartFeed, appendToChartFeed, emptyChartFeed, joinBatches } from './chart-feed';
import { chartBatchOfFrame, chartSpacing, latestAngle, latestTime } from './chart-points';
import { type ClosedFormEngine, loadClosedFormEngine } from './closed-form-engine';
import { ClosedFormPanel } from './closed-form-panel';
import { type ClosedFormView, closedFormView } from './closed-form-view';
import { JointView } from './joint-view';
import { type ResidualPeak, largestResidual } from './residual';
import { runChoice } from './run-choice';
import { SaveRevisionPanel } from './save-revision-panel';
import { type RunStatus, isRunActive, runStatusText, statusOfRunEnd } from './run-status';
import { type ScenarioEdits, editedScenario } from './scenario-draft';
import { describeInputTerm, formatQuantity, scenarioFacts } from './scenario-facts';
import { type FieldEdit, TuningForm } from './tuning-form';

/** Quiet time after the last keystroke before the closed form is solved again, ms. */
export const CLOSED_FORM_DEBOUNCE_MS = 150;

/** The twin-against-closed-form comparison after a run. */
type ResidualState = { kind: 'none' } | { kind: 'measured'; peak: ResidualPeak; inline: boolean } | { kind: 'unavailable'; message: string };

const LINK_TEXT: Record<RunLink, string> = {
  connecting: 'connecting to the twin…',
  connected: 'twin connected',
  reconnecting: 'twin link lost, reconnecting…',
  refused: 'twin link refused: sign in again',
};

/**
 * One scenario on the bench: its quantities and their unsaved edits, the live twin in 3D, the
 * angle chart with the closed form over it, and the closed-form panel.
 */
@Component({
  selector: 'kt-bench',
  changeDetection: ChangeDetectionStrategy.OnPush,
  providers: [RunSocket],
  imports: [AngleChart, ClosedFormPanel, JointView, MatButtonModule, MatIconModule, RouterLink, SaveRevisionPanel, TuningForm],
  templateUrl: './bench.html',
  styleUrl: './bench.css',
})
export class Bench {
  private readonly scenarios = inject(ScenarioApi);
  private readonly runs = inject(RunSocket);
  private readonly title = inject(Title);
  private readonly router = inject(Router);

  /** Scenario id from the route (`/bench/:id`). */
  readonly id = input.required<string>();

  protected readonly detail = toSignal(
    toObservable(this.id).pipe(
      switchMap((id) =>
        this.scenarios.get(id).pipe(
          map((value): LoadState<LibraryDetail> => ({ status: 'ready', value })),
          catchError((failure: unknown) => of<LoadState<LibraryDetail>>({ status: 'failed', message: apiErrorMessage(failure) })),
          startWith<LoadState<LibraryDetail>>({ status: 'loading' }),
        ),
      ),
    ),
    { initialValue: { status: 'loading' } as LoadState<LibraryDetail> },
  );
  protected readonly link = toSignal(this.runs.link$, { initialValue: 'connecting' as RunLink });

  private readonly runStatus = signal<RunStatus>({ kind: 'idle' });
  protected readonly status = this.runStatus.asReadonly();
  private readonly fieldErrors = signal<FieldError[]>([]);
  protected readonly runErrors = this.fieldErrors.asReadonly();
  private readonly chartFeed = signal<ChartFeed>(emptyChartFeed(0));
  protected readonly feed = this.chartFeed.asReadonly();
  private readonly jointAngle = signal(0);
  protected readonly angle = this.jointAngle.asReadonly();
  private readonly scenarioEdits = signal<ScenarioEdits>({});
  protected readonly edits = this.scenarioEdits.asReadonly();
  private readonly engine = signal<ClosedFormEngine | null>(null);
  private readonly engineFailure = signal<string | null>(null);
  private readonly residualState = signal<ResidualState>({ kind: 'none' });
  protected readonly residual = this.residualState.asReadonly();

  /** A newer revision the save panel brought in (after a save, or theirs after a conflict). */
  private readonly replacedDetail = signal<LibraryDetail | null>(null);
  protected readonly scenario = computed(() => {
    const replaced = this.replacedDetail();
    if (replaced) return replaced;
    const state = this.detail();
    return state.status === 'ready' ? state.value : null;
  });
  protected readonly loadFailure = computed(() => {
    const state = this.detail();
    return state.status === 'failed' ? state.message : '';
  });
  /** The stored scenario with the edits applied and validated; null before it loads. */
  protected readonly edited = computed(() => {
    const detail = this.scenario();
    return detail ? editedScenario(detail.scenario, this.scenarioEdits()) : null;
  });
  protected readonly hasEdits = computed(() => Object.keys(this.scenarioEdits()).length > 0);
  protected readonly editErrors = computed(() => {
    const edited = this.edited();
    return edited && !edited.ok ? edited.errors : [];
  });
  /** What the bench shows: the edited scenario while it is valid, else the stored one. */
  private readonly current = computed((): Scenario | null => {
    const edited = this.edited();
    if (edited?.ok) return edited.value;
    return this.scenario()?.scenario ?? null;
  });
  protected readonly facts = computed(() => {
    const scenario = this.current();
    return scenario ? scenarioFacts(scenario) : [];
  });
  protected readonly inputs = computed(() => (this.current()?.inputs ?? []).map((term, index) => ({ index, text: describeInputTerm(term) })));
  protected readonly horizon = computed(() => this.current()?.horizon ?? 1);
  /** The edited scenario once typing pauses: what the closed form is solved for. */
  private readonly settled = toSignal(toObservable(this.edited).pipe(debounceTime(CLOSED_FORM_DEBOUNCE_MS)), { initialValue: null });
  protected readonly closedForm = computed((): ClosedFormView => {
    const failure = this.engineFailure();
    if (failure !== null) return { kind: 'failed', message: failure };
    const settled = this.settled();
    return settled ? closedFormView(this.engine(), settled) : { kind: 'loading' };
  });
  protected readonly closedFormTrace = computed(() => {
    const view = this.closedForm();
    return view.kind === 'solved' ? view.trace : null;
  });
  protected readonly residualText = computed(() => {
    const residual = this.residualState();
    if (residual.kind !== 'measured') return residual.kind === 'unavailable' ? residual.message : '';
    const { peak } = residual;
    return `Last run: max |twin − closed form| = ${formatQuantity(peak.maxAbs, 'rad')} at t = ${formatQuantity(peak.time, 's')} (${peak.samples} twin samples${residual.inline ? ', edited scenario' : ''})`;
  });
  protected readonly statusText = computed(() => runStatusText(this.runStatus()));
  protected readonly canRun = computed(() => this.scenario() !== null && this.editErrors().length === 0 && !isRunActive(this.runStatus()));
  protected readonly canStop = computed(() => isRunActive(this.runStatus()));
  protected readonly linkText = computed(() => LINK_TEXT[this.link()]);

  /** Time of the last charted sample of the current run, s. */
  private chartedUntil = Number.NEGATIVE_INFINITY;
  /** Chart spacing of the current run, s (from the horizon it was started with). */
  private runSpacing = 0;
  /** The scenario the current run was started with, for the residual; null before any run. */
  private ranScenario: { scenario: Scenario; inline: boolean } | null = null;

  constructor() {
    this.runs.events$.pipe(takeUntilDestroyed()).subscribe((event) => this.applyRunEvent(event));

    loadClosedFormEngine().then(
      (engine) => this.engine.set(engine),
      (failure: unknown) => this.engineFailure.set(`The closed-form engine could not be loaded (${failure instanceof Error ? failure.message : String(failure)}). Reload the page to try again.`),
    );

    // Another scenario id drops a revision the save panel brought in for the previous one.
    effect(() => {
      this.id();
      untracked(() => this.replacedDetail.set(null));
    });

    // Another scenario (or a reload of this one) starts with no edits.
    effect(() => {
      this.scenario();
      untracked(() => this.scenarioEdits.set({}));
    });

    effect(() => {
      const detail = this.scenario();
      if (detail) this.title.setTitle(`${detail.name} · Bench · Kinetwin`);
    });

    effect(() => {
      const initialAngle = this.current()?.initial.angle;
      if (initialAngle === undefined) return;
      // Before any run the joint rests at its (possibly edited) initial angle; a status change must not re-run this.
      untracked(() => {
        if (this.runStatus().kind === 'idle') this.jointAngle.set(initialAngle);
      });
    });
  }

  /** Records one field's text; validation and the closed form follow from the edits signal. */
  protected editField(edit: FieldEdit): void {
    this.scenarioEdits.update((edits) => ({ ...edits, [edit.path]: edit.text }));
  }

  /** Shows a newer revision of the same scenario; its effect on `scenario()` clears the edits. */
  protected showRevision(detail: LibraryDetail): void {
    this.replacedDetail.set(detail);
  }

  /** The edit went into a new scenario: open that one on the bench. */
  protected async openCopy(detail: LibraryDetail): Promise<void> {
    this.replacedDetail.set(null);
    await this.router.navigate(['/bench', detail.id]);
  }

  protected resetEdits(): void {
    this.scenarioEdits.set({});
  }

  /**
   * Starts the twin from t = 0; the chart and the joint restart with it. The stored scenario runs
   * by id unless the edits change it; then the edited scenario is sent inline.
   */
  protected async runScenario(): Promise<void> {
    const detail = this.scenario();
    if (!detail || isRunActive(this.runStatus())) return;
    const choice = runChoice(detail.id, detail.scenario, this.scenarioEdits());
    if (!choice.ok) {
      this.fieldErrors.set(choice.errors);
      this.runStatus.set({ kind: 'error', message: 'the edited scenario has errors: fix them or reset to saved' });
      return;
    }
    const scenario = choice.scenario;
    this.ranScenario = { scenario, inline: choice.inline };
    this.residualState.set({ kind: 'none' });
    this.chartFeed.update((feed) => emptyChartFeed(feed.run + 1));
    this.chartedUntil = Number.NEGATIVE_INFINITY;
    this.runSpacing = chartSpacing(scenario.horizon);
    this.jointAngle.set(scenario.initial.angle);
    this.fieldErrors.set([]);
    this.runStatus.set({ kind: 'starting' });

    const ack = await this.runs.start(choice.request);
    // Frames, the end or a Stop may already have moved the status on; only a waiting start is ours to settle.
    if (this.runStatus().kind !== 'starting') return;
    if (ack.status === 'ok') {
      this.runStatus.set({ kind: 'running', time: 0 });
    } else {
      this.fieldErrors.set(ack.errors);
      this.runStatus.set({ kind: 'error', message: ack.errors[0]?.message ?? 'the server refused the run' });
    }
  }

  protected async stopRun(): Promise<void> {
    const status = this.runStatus();
    if (!isRunActive(status)) return;
    const ack = await this.runs.stop();
    if (ack === null) {
      // Nothing was running yet: the start request was abandoned before its answer.
      if (this.runStatus().kind === 'starting') this.runStatus.set({ kind: 'stopped', time: 0 });
    } else if (ack.status === 'error' && isRunActive(this.runStatus())) {
      this.fieldErrors.set(ack.errors);
      this.runStatus.set({ kind: 'error', message: ack.errors[0]?.message ?? 'the server did not stop the run' });
    }
    // On success the run's 'end' event (reason 'stopped') sets the status.
  }

  private applyRunEvent(event: RunEvent): void {
    switch (event.kind) {
      case 'frame': {
        const { batch, lastTime } = chartBatchOfFrame(event.frame, this.chartedUntil, this.runSpacing);
        this.chartedUntil = lastTime;
        this.chartFeed.update((feed) => appendToChartFeed(feed, batch));
        const angle = latestAngle(event.frame);
        if (angle !== null) this.jointAngle.set(angle);
        const time = latestTime(event.frame);
        if (time !== null && isRunActive(this.runStatus())) this.runStatus.set({ kind: 'running', time });
        break;
      }
      case 'end':
        this.runStatus.set(statusOfRunEnd(event.end));
        void this.measureResidual();
        break;
      case 'failed':
        this.fieldErrors.set(event.failure.errors);
        this.runStatus.set({ kind: 'error', message: event.failure.errors[0]?.message ?? 'the run failed' });
        break;
    }
  }

  /** Compares the run's charted samples with the closed form of the scenario it ran. */
  private async measureResidual(): Promise<void> {
    const ran = this.ranScenario;
    const feed = this.chartFeed();
    if (!ran || feed.size === 0) return;
    let engine: ClosedFormEngine;
    try {
      engine = this.engine() ?? (await loadClosedFormEngine());
    } catch {
      this.residualState.set({ kind: 'unavailable', message: 'No residual: the closed-form engine could not be loaded.' });
      return;
    }
    // A newer run may have started while the engine loaded.
    if (this.ranScenario !== ran || this.chartFeed().run !== feed.run) return;
    try {
      const solved = engine.solveClosedForm(ran.scenario);
      if (!solved.ok) {
        this.residualState.set({ kind: 'unavailable', message: `No residual: ${solved.errors[0]?.message ?? 'the scenario has no closed form'}.` });
        return;
      }
      const plan = solved.value.plan;
      const peak = largestResidual(joinBatches(feed.batches, 0, feed.size), (t) => engine.responseAt(plan, t, 0));
      this.residualState.set(peak ? { kind: 'measured', peak, inline: ran.inline } : { kind: 'unavailable', message: 'No residual: the run gave no finite samples.' });
    } catch (failure) {
      this.residualState.set({ kind: 'unavailable', message: `No residual: ${failure instanceof Error ? failure.message : String(failure)}` });
    }
  }
}
