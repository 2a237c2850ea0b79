import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Title } from '@angular/platform-browser';
import { RouterLink } from '@angular/router';
import type { ScenarioDetail } from '@kinetwin/shared/protocol/api-types';
import type { FieldError } from '@kinetwin/shared/validation/field-errors';
import { catchError, map, of, startWith, switchMap } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import type { LoadState } from '../core/load-state';
import { type RunEvent, type RunLink, RunSocket } from '../core/run-socket';
import { ScenarioApi } from '../core/scenario-api';
import { AngleChart } from './angle-chart';
import { type ChartFeed, appendToChartFeed, emptyChartFeed } from './chart-feed';
import { chartBatchOfFrame, chartSpacing, latestAngle, latestTime } from './chart-points';
import { JointView } from './joint-view';
import { type RunStatus, isRunActive, runStatusText, statusOfRunEnd } from './run-status';
import { describeInputTerm, scenarioFacts } from './scenario-facts';

const LINK_TEXT: Record<RunLink, string> = {
  connecting: 'connecting to the twin…',
  connected: 'twin connected',
  reconnecting: 'twin link lost, reconnecting…',
  refused: 'twin link refused: sign in again',
};

/** One scenario on the bench: its quantities, the live twin in 3D and its angle chart. */
@Component({
  selector: 'kt-bench',
  changeDetection: ChangeDetectionStrategy.OnPush,
  providers: [RunSocket],
  imports: [AngleChart, JointView, MatButtonModule, MatIconModule, RouterLink],
  templateUrl: './bench.html',
  styleUrl: './bench.css',
})
export class Bench {
  private readonly scenarios = inject(ScenarioApi);
  private readonly runs = inject(RunSocket);
  private readonly title = inject(Title);

  /** Scenario id from the route (`/bench/:id`). */
  readonly id = input.required<string>();

  protected readonly detail = toSignal(
    toObservable(this.id).pipe(
      switchMap((id) =>
        this.scenarios.get(id).pipe(
          map((value): LoadState<ScenarioDetail> => ({ status: 'ready', value })),
          catchError((failure: unknown) => of<LoadState<ScenarioDetail>>({ status: 'failed', message: apiErrorMessage(failure) })),
          startWith<LoadState<ScenarioDetail>>({ status: 'loading' }),
        ),
      ),
    ),
    { initialValue: { status: 'loading' } as LoadState<ScenarioDetail> },
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

  protected readonly scenario = computed(() => {
    const state = this.detail();
    return state.status === 'ready' ? state.value : null;
  });
  protected readonly loadFailure = computed(() => {
    const state = this.detail();
    return state.status === 'failed' ? state.message : '';
  });
  protected readonly facts = computed(() => {
    const detail = this.scenario();
    return detail ? scenarioFacts(detail.scenario) : [];
  });
  protected readonly inputs = computed(() => (this.scenario()?.scenario.inputs ?? []).map((term, index) => ({ index, text: describeInputTerm(term) })));
  protected readonly horizon = computed(() => this.scenario()?.scenario.horizon ?? 1);
  protected readonly statusText = computed(() => runStatusText(this.runStatus()));
  protected readonly canRun = computed(() => this.scenario() !== null && !isRunActive(this.runStatus()));
  protected readonly canStop = computed(() => isRunActive(this.runStatus()));
  protected readonly linkText = computed(() => LINK_TEXT[this.link()]);

  /** Time of the last charted sample of the current run, s. */
  private chartedUntil = Number.NEGATIVE_INFINITY;

  constructor() {
    this.runs.events$.pipe(takeUntilDestroyed()).subscribe((event) => this.applyRunEvent(event));

    effect(() => {
      const detail = this.scenario();
      if (!detail) return;
      this.title.setTitle(`${detail.name} · Bench · Kinetwin`);
      // Before any run the joint rests at its initial angle; a status change must not re-run this.
      untracked(() => {
        if (this.runStatus().kind === 'idle') this.jointAngle.set(detail.scenario.initial.angle);
      });
    });
  }

  /** Starts the twin from t = 0; the chart and the joint restart with it. */
  protected async runScenario(): Promise<void> {
    const detail = this.scenario();
    if (!detail || isRunActive(this.runStatus())) return;
    this.chartFeed.update((feed) => emptyChartFeed(feed.run + 1));
    this.chartedUntil = Number.NEGATIVE_INFINITY;
    this.jointAngle.set(detail.scenario.initial.angle);
    this.fieldErrors.set([]);
    this.runStatus.set({ kind: 'starting' });

    const ack = await this.runs.start({ scenarioId: detail.id });
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
        const { batch, lastTime } = chartBatchOfFrame(event.frame, this.chartedUntil, chartSpacing(this.horizon()));
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
        break;
      case 'failed':
        this.fieldErrors.set(event.failure.errors);
        this.runStatus.set({ kind: 'error', message: event.failure.errors[0]?.message ?? 'the run failed' });
        break;
    }
  }
}
