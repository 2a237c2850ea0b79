import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatSliderModule } from '@angular/material/slider';
import { Title } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import type { LibraryDetail } from '@kinetwin/shared/protocol/library-api';
import type { RunSample } from '@kinetwin/shared/protocol/run-events';
import type { InputTerm, Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';
import { catchError, debounceTime, map, of, startWith, switchMap } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import type { LoadState } from '../core/load-state';
import { type RunEvent, type RunLink, RunSocket } from '../core/run-socket';
import { ScenarioApi } from '../core/scenario-api';
import { AngleChart } from './angle-chart';
import { type ChartFeed, appendToChartFeed, emptyChartFeed, joinBatches } from './chart-feed';
import { chartBatchOfFrame, chartSpacing, latestAngle, latestTime } from './chart-points';
import { ChecksPanel } from './checks-panel';
import { type ClosedFormEngine, loadClosedFormEngine } from './closed-form-engine';
import { ClosedFormPanel } from './closed-form-panel';
import { type ClosedFormView, closedFormView } from './closed-form-view';
import { FrequencyPanel } from './frequency-panel';
import { JointView } from './joint-view';
import { type KickEntry, KickPanel, type KickRequest } from './kick-panel';
import { LinearizePanel } from './linearize-panel';
import { type ResidualPeak, largestResidual } from './residual';
import { RootLocusPanel } from './root-locus-panel';
import { runChoice } from './run-choice';
import { SaveRevisionPanel } from './save-revision-panel';
import { RunRecord, type SampleFlags, latestFlags } from './run-record';
import { sampleReadings } from './run-sample-text';
import { type RunStatus, isRunActive, isRunLive, runStatusText, statusOfRunEnd } from './run-status';
import { applyFieldEdits } from '@kinetwin/shared/scenario/field-edits';
import { withAppendedTerms } from '@kinetwin/shared/twin/kick-rule';
import type { ScenarioEdits } from './scenario-draft';
import { describeInputTerm, formatQuantity, scenarioFacts } from './scenario-facts';
import { type FieldEdit, TuningForm } from './tuning-form';

/** Quiet time after the last keystroke before the closed form is solved again, ms. */
export const CLOSED_FORM_DEBOUNCE_MS = 150;

/** Playback speeds offered, × real time; 0 runs as fast as the server can. */
export const SPEED_CHOICES: readonly { value: number; label: string }[] = [
  { value: 0.1, label: '×0.1' },
  { value: 0.5, label: '×0.5' },
  { value: 1, label: '×1' },
  { value: 2, label: '×2' },
  { value: 5, label: '×5' },
  { value: 10, label: '×10' },
  { value: 0, label: 'max' },
];
/** Playback speed the server assumes when a start request names none, × real time. */
const SERVER_DEFAULT_SPEED = 1;

/** A kick the run took, with the id the kick list tracks it by. */
interface AppliedKick {
  id: number;
  term: InputTerm;
}

/** The scenario with the run's kicks appended to its forcing terms: its closed form is the whole run's, by superposition. */
function withKicks(scenario: Scenario, kicks: readonly AppliedKick[]): Parsed<Scenario> {
  return withAppendedTerms(scenario, kicks.map((kick) => kick.term));
}

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
 * angle chart with the closed form over it, the checks panel, the frequency panel, the root
 * locus, the linear model about a pose (for a gravity-loaded joint), and the closed-form panel.
 */
@Component({
  selector: 'kt-bench',
  changeDetection: ChangeDetectionStrategy.OnPush,
  providers: [RunSocket],
  imports: [AngleChart, ChecksPanel, ClosedFormPanel, FrequencyPanel, JointView, KickPanel, LinearizePanel, MatButtonModule, MatIconModule, MatSliderModule, RootLocusPanel, RouterLink, SaveRevisionPanel, TuningForm],
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
  /** Kicks of earlier runs the user kept as forcing terms of the draft, after the saved inputs. */
  private readonly keptTerms = signal<readonly InputTerm[]>([]);
  protected readonly keptKicks = computed(() => this.keptTerms().length > 0);
  private readonly engine = signal<ClosedFormEngine | null>(null);
  private readonly engineFailure = signal<string | null>(null);
  private readonly residualState = signal<ResidualState>({ kind: 'none' });
  protected readonly residual = this.residualState.asReadonly();
  /** Playback speed for the live run and the next one, × real time (0 = as fast as possible). */
  private readonly playbackSpeed = signal(SERVER_DEFAULT_SPEED);
  protected readonly speed = this.playbackSpeed.asReadonly();
  /** The kicks the current run took; the closed form adds them to the edited scenario's inputs. */
  private readonly runKicks = signal<readonly AppliedKick[]>([]);
  private readonly kickFailures = signal<FieldError[]>([]);
  protected readonly kickErrors = this.kickFailures.asReadonly();
  /** The sample the scrub slider points at; null while the joint follows the stream. */
  private readonly scrubSample = signal<RunSample | null>(null);
  protected readonly scrubbed = this.scrubSample.asReadonly();
  /** Time of the last sample the run has computed and sent, s: the scrub slider's end. */
  private readonly computedTime = signal(0);
  protected readonly computedUntil = this.computedTime.asReadonly();
  /** Samples recorded for scrubbing once the run is over (0 before any run). */
  private readonly recordedSamples = signal(0);
  private readonly newestFlags = signal<SampleFlags>({ saturating: false, sticking: false });
  protected readonly flags = this.newestFlags.asReadonly();
  protected readonly speedChoices = SPEED_CHOICES;
  protected readonly scrubLabel = (time: number): string => `${time.toFixed(2)} s`;

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
  /** The stored scenario with the kept kicks appended: what the tuning form's fields start from. */
  protected readonly draftBase = computed((): Scenario | null => {
    const detail = this.scenario();
    if (!detail) return null;
    const base = withAppendedTerms(detail.scenario, this.keptTerms());
    // Keeping checks the term limit first, so this holds; the stored scenario is the safe fallback.
    return base.ok ? base.value : detail.scenario;
  });
  /** The draft (kept kicks, then the edits) applied and validated; null before it loads. */
  protected readonly edited = computed(() => {
    const base = this.draftBase();
    return base ? applyFieldEdits(base, this.scenarioEdits()) : null;
  });
  protected readonly hasEdits = computed(() => Object.keys(this.scenarioEdits()).length > 0 || this.keptTerms().length > 0);
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
    if (!settled) return { kind: 'loading' };
    const kicks = this.runKicks();
    const whole: Parsed<Scenario> = settled.ok ? withKicks(settled.value, kicks) : settled;
    return closedFormView(this.engine(), whole);
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
  protected readonly live = computed(() => isRunLive(this.runStatus()));
  protected readonly paused = computed(() => this.runStatus().kind === 'paused');
  protected readonly closedLoop = computed(() => this.current()?.controller.mode === 'pid');
  protected readonly kickEntries = computed((): KickEntry[] => this.runKicks().map((kick) => ({ id: kick.id, text: describeInputTerm(kick.term) })));
  /** A finished run's kicks may join the draft; a live run may still take more. */
  protected readonly canKeepKicks = computed(() => this.runKicks().length > 0 && !isRunActive(this.runStatus()));
  /** The scrub slider shows while the live run is paused, or once a run has ended with samples. */
  protected readonly canScrub = computed(() => {
    const status = this.runStatus();
    return status.kind === 'paused' || (!isRunActive(status) && this.recordedSamples() > 0);
  });
  protected readonly scrubReadings = computed(() => {
    const sample = this.scrubSample();
    return sample ? sampleReadings(sample) : [];
  });
  protected readonly linkText = computed(() => LINK_TEXT[this.link()]);

  /** Time of the last charted sample of the current run, s. */
  private chartedUntil = Number.NEGATIVE_INFINITY;
  /** Chart spacing of the current run, s (from the horizon it was started with). */
  private runSpacing = 0;
  /** The scenario the current run was started with, for the residual; null before any run. */
  private ranScenario: { scenario: Scenario; inline: boolean } | null = null;
  /** The server's id of the run this bench shows while it is live; null otherwise. */
  private liveRunId: string | null = null;
  /** The current run's samples, for scrubbing after it ends. */
  private record = new RunRecord(0);
  /** The newest streamed angle, rad: where the joint returns when a scrubbed run resumes. */
  private streamedAngle = 0;
  private nextKickId = 1;

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
      untracked(() => {
        this.scenarioEdits.set({});
        this.keptTerms.set([]);
      });
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
    this.keptTerms.set([]);
  }

  /**
   * Keeps the last run's kicks as forcing terms of the draft (after its inputs, at the times they
   * landed), so the next run, the closed form and a save carry them; the kick list then empties.
   */
  protected keepKicks(): void {
    const base = this.draftBase();
    const kicks = this.runKicks();
    if (!base || !this.canKeepKicks()) return;
    const kept = withKicks(base, kicks);
    if (!kept.ok) {
      this.kickFailures.set(kept.errors);
      return;
    }
    this.keptTerms.update((terms) => [...terms, ...kicks.map((kick) => kick.term)]);
    this.runKicks.set([]);
    this.kickFailures.set([]);
  }

  /**
   * Starts the twin from t = 0; the chart and the joint restart with it. The stored scenario runs
   * by id unless the edits change it; then the edited scenario is sent inline.
   */
  protected async runScenario(): Promise<void> {
    const detail = this.scenario();
    if (!detail || isRunActive(this.runStatus())) return;
    const choice = runChoice(detail.id, detail.scenario, this.scenarioEdits(), this.keptTerms());
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
    this.streamedAngle = scenario.initial.angle;
    this.fieldErrors.set([]);
    this.runKicks.set([]);
    this.kickFailures.set([]);
    this.scrubSample.set(null);
    this.computedTime.set(0);
    this.record = new RunRecord(this.runSpacing);
    this.recordedSamples.set(0);
    this.newestFlags.set({ saturating: false, sticking: false });
    this.liveRunId = null;
    this.runStatus.set({ kind: 'starting' });

    const speed = this.playbackSpeed();
    // The server's default speed goes unsaid, so a plain run asks for exactly what it did before speeds existed.
    const request = speed === SERVER_DEFAULT_SPEED ? choice.request : { ...choice.request, speed };
    const ack = await this.runs.start(request);
    // Frames, the end or a Stop may already have moved the status on; only a waiting start is ours to settle.
    if (ack.status === 'ok' && isRunActive(this.runStatus())) this.liveRunId = ack.data.runId;
    if (this.runStatus().kind !== 'starting') return;
    if (ack.status === 'ok') {
      this.runStatus.set({ kind: 'running', time: 0 });
      // The speed changed while the start was on its way: the live run takes the newer one.
      if (this.playbackSpeed() !== speed) void this.applySpeed(this.playbackSpeed());
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

  /** Pauses the live run; the status shows the time it stopped at. */
  protected async pauseRun(): Promise<void> {
    const runId = this.liveRunId;
    if (runId === null || this.runStatus().kind !== 'running') return;
    const ack = await this.runs.pause(runId);
    if (runId !== this.liveRunId || !isRunLive(this.runStatus())) return;
    if (ack.status === 'ok') {
      this.runStatus.set({ kind: 'paused', time: ack.data.simulatedTime });
    } else {
      this.fieldErrors.set(ack.errors);
    }
  }

  /** Resumes the paused run from where it was; the joint follows the stream again. */
  protected async resumeRun(): Promise<void> {
    const runId = this.liveRunId;
    if (runId === null || this.runStatus().kind !== 'paused') return;
    const ack = await this.runs.resume(runId);
    if (runId !== this.liveRunId || !isRunLive(this.runStatus())) return;
    if (ack.status === 'ok') {
      this.scrubSample.set(null);
      this.jointAngle.set(this.streamedAngle);
      this.runStatus.set({ kind: ack.data.state, time: ack.data.simulatedTime });
    } else {
      this.fieldErrors.set(ack.errors);
    }
  }

  /** Picks the playback speed from the selector: for the live run now, and for the next Run. */
  protected chooseSpeed(event: Event): void {
    const speed = Number((event.target as HTMLSelectElement).value);
    if (!SPEED_CHOICES.some((choice) => choice.value === speed)) return;
    this.playbackSpeed.set(speed);
    void this.applySpeed(speed);
  }

  private async applySpeed(speed: number): Promise<void> {
    const runId = this.liveRunId;
    if (runId === null || !isRunLive(this.runStatus())) return;
    const ack = await this.runs.setSpeed(runId, speed);
    if (ack.status === 'error' && runId === this.liveRunId) this.fieldErrors.set(ack.errors);
  }

  /**
   * Shows the run at `time` (s): the server's recorded sample while the run is live (which also
   * pauses it), else the nearest sample this bench recorded.
   */
  protected async scrubTo(time: number): Promise<void> {
    if (!Number.isFinite(time)) return;
    const runId = this.liveRunId;
    if (runId !== null && isRunLive(this.runStatus())) {
      const ack = await this.runs.scrub(runId, time);
      if (runId !== this.liveRunId || !isRunLive(this.runStatus())) return;
      if (ack.status === 'ok') {
        this.showSample(ack.data);
        this.runStatus.set({ kind: 'paused', time: this.computedTime() });
      } else {
        this.fieldErrors.set(ack.errors);
      }
      return;
    }
    const sample = this.record.nearest(time);
    if (sample) this.showSample(sample);
  }

  /** Kicks the live run; the forcing term it took joins the closed form and the kick list. */
  protected async kickRun(kick: KickRequest): Promise<void> {
    const runId = this.liveRunId;
    if (runId === null || !isRunLive(this.runStatus())) return;
    const ack = await this.runs.kick(runId, kick);
    if (runId !== this.liveRunId) return;
    if (ack.status === 'ok') {
      const id = this.nextKickId++;
      this.runKicks.update((kicks) => [...kicks, { id, term: ack.data.term }]);
      this.kickFailures.set([]);
    } else {
      this.kickFailures.set(ack.errors);
    }
  }

  private showSample(sample: RunSample): void {
    this.scrubSample.set(sample);
    if (Number.isFinite(sample.angle)) this.jointAngle.set(sample.angle);
  }

  private applyRunEvent(event: RunEvent): void {
    switch (event.kind) {
      case 'frame': {
        const { batch, lastTime } = chartBatchOfFrame(event.frame, this.chartedUntil, this.runSpacing);
        this.chartedUntil = lastTime;
        this.chartFeed.update((feed) => appendToChartFeed(feed, batch));
        this.record.append(event.frame);
        const angle = latestAngle(event.frame);
        if (angle !== null) {
          this.streamedAngle = angle;
          // A scrubbed sample holds the joint until the run resumes.
          if (this.scrubSample() === null) this.jointAngle.set(angle);
        }
        const flags = latestFlags(event.frame);
        if (flags) this.newestFlags.set(flags);
        const time = latestTime(event.frame);
        if (time !== null) {
          this.computedTime.set(Math.max(this.computedTime(), time));
          // Frames sent before a pause took effect may trail its answer: the run stays paused.
          const kind = this.runStatus().kind === 'paused' ? 'paused' : 'running';
          if (isRunActive(this.runStatus())) this.runStatus.set({ kind, time: kind === 'paused' ? this.computedTime() : time });
        }
        break;
      }
      case 'end':
        this.liveRunId = null;
        this.recordedSamples.set(this.record.size);
        this.runStatus.set(statusOfRunEnd(event.end));
        void this.measureResidual();
        break;
      case 'failed':
        this.liveRunId = null;
        this.recordedSamples.set(this.record.size);
        this.fieldErrors.set(event.failure.errors);
        this.runStatus.set({ kind: 'error', message: event.failure.errors[0]?.message ?? 'the run failed' });
        break;
    }
  }

  /** Compares the run's charted samples with the closed form of the scenario it ran. */
  private async measureResidual(): Promise<void> {
    const ran = this.ranScenario;
    const feed = this.chartFeed();
    // Kept as the run ended: keeping them as draft terms afterwards must not change this run's closed form.
    const kicks = this.runKicks();
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
      // The kicks joined the run's inputs on the server: the closed form of the run takes them too.
      const whole = withKicks(ran.scenario, kicks);
      const solved = whole.ok ? engine.solveClosedForm(whole.value) : whole;
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
