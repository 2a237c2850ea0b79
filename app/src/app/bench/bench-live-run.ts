import { DestroyRef, Injectable, computed, effect, inject, signal, untracked } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import type { RunSample } from '@kinetwin/shared/protocol/run-events';
import type { InputTerm, Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { withAppendedTerms } from '@kinetwin/shared/twin/kick-rule';
import type { FieldError } from '@kinetwin/shared/validation/field-errors';
import { type RunEvent, type RunLink, RunSocket } from '../core/run-socket';
import { BenchDraft } from './bench-draft';
import { type ChartFeed, appendToChartFeed, emptyChartFeed, joinBatches } from './chart-feed';
import { chartBatchOfFrame, chartSpacing, latestAngle, latestTime } from './chart-points';
import { type ClosedFormEngine, loadClosedFormEngine } from './closed-form-engine';
import type { KickEntry, KickRequest } from './kick-panel';
import { type ResidualPeak, largestResidual } from './residual';
import { RunRecord, type SampleFlags, latestFlags } from './run-record';
import { sampleReadings } from './run-sample-text';
import { type RunStatus, isRunActive, isRunLive, runStatusText, statusOfRunEnd } from './run-status';
import { describeInputTerm } from './scenario-facts';

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

/** The twin-against-closed-form comparison after a run. */
export type ResidualState = { kind: 'none' } | { kind: 'measured'; peak: ResidualPeak; inline: boolean } | { kind: 'unavailable'; message: string };

const LINK_TEXT: Record<RunLink, string> = {
  connecting: 'connecting to the twin…',
  connected: 'twin connected',
  reconnecting: 'twin link lost, reconnecting…',
  refused: 'twin link refused: sign in again',
};

/**
 * The bench's live run: start, stop, pause, resume, speed, scrub and kick over the /runs socket;
 * the streamed frames as a chart feed and a joint angle; the kicks the run took; the residual
 * against the closed form once it ends. Provided by the bench component beside its RunSocket.
 */
@Injectable()
export class BenchLiveRun {
  private readonly runs = inject(RunSocket);
  private readonly draft = inject(BenchDraft);

  readonly link = toSignal(this.runs.link$, { initialValue: 'connecting' as RunLink });
  readonly linkText = computed(() => LINK_TEXT[this.link()]);

  private readonly runStatus = signal<RunStatus>({ kind: 'idle' });
  readonly status = this.runStatus.asReadonly();
  private readonly fieldErrors = signal<FieldError[]>([]);
  readonly errors = this.fieldErrors.asReadonly();
  private readonly chartFeed = signal<ChartFeed>(emptyChartFeed(0));
  readonly feed = this.chartFeed.asReadonly();
  private readonly jointAngle = signal(0);
  readonly angle = this.jointAngle.asReadonly();
  private readonly residualState = signal<ResidualState>({ kind: 'none' });
  readonly residual = this.residualState.asReadonly();
  /** Playback speed for the live run and the next one, × real time (0 = as fast as possible). */
  private readonly playbackSpeed = signal(SERVER_DEFAULT_SPEED);
  readonly speed = this.playbackSpeed.asReadonly();
  /** The kicks the current run took; the closed form adds them to the draft's inputs. */
  private readonly runKicks = signal<readonly AppliedKick[]>([]);
  readonly kickTerms = computed(() => this.runKicks().map((kick) => kick.term));
  private readonly kickFailures = signal<FieldError[]>([]);
  readonly kickErrors = this.kickFailures.asReadonly();
  /** The sample the scrub slider points at; null while the joint follows the stream. */
  private readonly scrubSample = signal<RunSample | null>(null);
  readonly scrubbed = this.scrubSample.asReadonly();
  /** Time of the last sample the run has computed and sent, s: the scrub slider's end. */
  private readonly computedTime = signal(0);
  readonly computedUntil = this.computedTime.asReadonly();
  /** Samples recorded for scrubbing once the run is over (0 before any run). */
  private readonly recordedSamples = signal(0);
  private readonly newestFlags = signal<SampleFlags>({ saturating: false, sticking: false });
  readonly flags = this.newestFlags.asReadonly();

  readonly statusText = computed(() => runStatusText(this.runStatus()));
  readonly canRun = computed(() => this.draft.detail() !== null && this.draft.errors().length === 0 && !isRunActive(this.runStatus()));
  readonly canStop = computed(() => isRunActive(this.runStatus()));
  readonly live = computed(() => isRunLive(this.runStatus()));
  readonly paused = computed(() => this.runStatus().kind === 'paused');
  readonly kickEntries = computed((): KickEntry[] => this.runKicks().map((kick) => ({ id: kick.id, text: describeInputTerm(kick.term) })));
  /** A finished run's kicks may join the draft; a live run may still take more. */
  readonly canKeepKicks = computed(() => this.runKicks().length > 0 && !isRunActive(this.runStatus()));
  /** The scrub slider shows while the live run is paused, or once a run has ended with samples. */
  readonly canScrub = computed(() => {
    const status = this.runStatus();
    return status.kind === 'paused' || (!isRunActive(status) && this.recordedSamples() > 0);
  });
  readonly scrubReadings = computed(() => {
    const sample = this.scrubSample();
    return sample ? sampleReadings(sample) : [];
  });

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
    this.runs.events$.pipe(takeUntilDestroyed(inject(DestroyRef))).subscribe((event) => this.applyRunEvent(event));

    effect(() => {
      const initialAngle = this.draft.current()?.initial.angle;
      if (initialAngle === undefined) return;
      // Before any run the joint rests at its (possibly edited) initial angle; a status change must not re-run this.
      untracked(() => {
        if (this.runStatus().kind === 'idle') this.jointAngle.set(initialAngle);
      });
    });
  }

  /**
   * Starts the twin from t = 0; the chart and the joint restart with it. The stored scenario runs
   * by id unless the draft changes it; then the draft is sent inline.
   */
  async start(): Promise<void> {
    if (isRunActive(this.runStatus())) return;
    const choice = this.draft.runChoice();
    if (!choice) return;
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

  async stop(): Promise<void> {
    if (!isRunActive(this.runStatus())) return;
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
  async pause(): Promise<void> {
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
  async resume(): Promise<void> {
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

  /** Sets the playback speed: for the live run now, and for the next start. Unknown speeds are ignored. */
  chooseSpeed(speed: number): void {
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
  async scrubTo(time: number): Promise<void> {
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
  async kick(kick: KickRequest): Promise<void> {
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

  /**
   * Keeps the finished run's kicks as forcing terms of the draft (after its inputs, at the times
   * they landed), so the next run, the closed form and a save carry them; the kick list empties.
   */
  keepKicks(): void {
    if (!this.canKeepKicks()) return;
    const kept = this.draft.keepTerms(this.kickTerms());
    if (!kept.ok) {
      this.kickFailures.set(kept.errors);
      return;
    }
    this.runKicks.set([]);
    this.kickFailures.set([]);
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
    // Taken as the run ended: keeping them as draft terms afterwards must not change this run's closed form.
    const kicks = this.kickTerms();
    if (!ran || feed.size === 0) return;
    let engine: ClosedFormEngine;
    try {
      engine = await loadClosedFormEngine();
    } catch {
      this.residualState.set({ kind: 'unavailable', message: 'No residual: the closed-form engine could not be loaded.' });
      return;
    }
    // A newer run may have started while the engine loaded.
    if (this.ranScenario !== ran || this.chartFeed().run !== feed.run) return;
    try {
      // The kicks joined the run's inputs on the server: the closed form of the run takes them too.
      const whole = withAppendedTerms(ran.scenario, kicks);
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
