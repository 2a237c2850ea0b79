import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, effect, inject, input, signal, untracked, viewChild } from '@angular/core';
import type { Layout } from 'plotly.js-dist-min';
import { ANGLE_AXIS_LIMIT, angleAxis } from './angle-axis';
import { PLOT_CONFIG, plotlyChartActions } from './chart-actions';
import { ChartControls } from './chart-controls';
import type { ChartFeed } from './chart-feed';
import { joinBatches } from './chart-feed';
import type { ClosedFormTrace } from './closed-form-view';

type Plotly = typeof import('plotly.js-dist-min').default;
type Data = Parameters<Plotly['react']>[1][number];

/** Line colour of the twin's angle trace: the theme's primary tone 40. */
const TRACE_COLOR = '#146871';
/** Line colour of the closed-form trace: the theme's tertiary (copper) tone 50. */
const CLOSED_FORM_COLOR = '#b4621b';

/**
 * Angle against time: the twin's run (trace 0, "twin") and the scenario's closed form (trace 1,
 * dashed, "closed form"), drawn with Plotly (imported on first use so it stays out of the first
 * page's bundle). New twin batches are appended with extendTraces; a new run, x range or closed
 * form redraws everything. The host's `data-samples` attribute counts the twin samples on the
 * plot, `data-closed-form-samples` the closed-form points. An angle past ±ANGLE_AXIS_LIMIT clips
 * the axis with a note (`data-axis-clipped`); `note` says why the closed form is missing or stale.
 */
@Component({
  selector: 'kt-angle-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    'data-test': 'angle-chart',
    '[attr.data-samples]': 'samples()',
    '[attr.data-closed-form-samples]': 'closedFormSamples()',
    '[attr.data-axis-clipped]': 'axisNote() !== null',
  },
  imports: [ChartControls],
  template: `
    <kt-chart-controls [actions]="actions" chartName="angle" fileName="angle-chart" />
    <div #plot class="plot" role="img" aria-label="Joint angle in radians against time in seconds"></div>
    @if (note(); as text) {
      <p class="chart-note" data-test="chart-note" role="status">{{ text }}</p>
    }
    @if (axisNote(); as text) {
      <p class="chart-note" data-test="axis-note">{{ text }}</p>
    }
    @if (failure(); as message) {
      <p class="chart-failure">{{ message }}</p>
    }
  `,
  styleUrl: './angle-chart.css',
})
export class AngleChart {
  /** Run length, s: the fixed x range. */
  readonly horizon = input.required<number>();
  readonly feed = input.required<ChartFeed>();
  /** The closed-form angle over the horizon; null when there is none to draw. */
  readonly closedForm = input<ClosedFormTrace | null>(null);
  /** Why the closed form is not drawn, or drawn from an earlier draft; null when it is current. */
  readonly note = input<string | null>(null);

  private readonly plot = viewChild.required<ElementRef<HTMLDivElement>>('plot');
  private readonly drawnSamples = signal(0);
  protected readonly samples = this.drawnSamples.asReadonly();
  private readonly drawnClosedFormSamples = signal(0);
  protected readonly closedFormSamples = this.drawnClosedFormSamples.asReadonly();
  private readonly failureText = signal<string | null>(null);
  protected readonly failure = this.failureText.asReadonly();
  private readonly axisText = signal<string | null>(null);
  protected readonly axisNote = this.axisText.asReadonly();
  private drawnLayout: Partial<Layout> | null = null;
  protected readonly actions = plotlyChartActions(() => this.plotly, () => this.plot().nativeElement, () => this.drawnLayout);

  private plotly: Plotly | null = null;
  private destroyed = false;
  /** What is on the plot now: which run, x range and how many of its batches. */
  private drawnRun = Number.NaN;
  private drawnHorizon = Number.NaN;
  private drawnBatches = 0;
  private drawnClosedForm: ClosedFormTrace | null | undefined = undefined;
  /** Plot calls run one after another; a queued sync draws everything missing when it runs. */
  private queue: Promise<void> = Promise.resolve();
  private syncQueued = false;

  constructor() {
    afterNextRender(async () => {
      try {
        this.plotly = (await import('plotly.js-dist-min')).default;
      } catch {
        this.failureText.set('The chart could not be loaded. Reload the page to try again.');
        return;
      }
      this.scheduleSync();
    });

    effect(() => {
      this.feed();
      this.horizon();
      this.closedForm();
      this.scheduleSync();
    });

    inject(DestroyRef).onDestroy(() => {
      this.destroyed = true;
      if (this.plotly) this.plotly.purge(this.plot().nativeElement);
    });
  }

  private scheduleSync(): void {
    if (!this.plotly || this.syncQueued) return;
    this.syncQueued = true;
    this.queue = this.queue
      .then(() => {
        this.syncQueued = false;
        return this.sync();
      })
      .catch((error: unknown) => {
        this.failureText.set(`The chart stopped drawing: ${error instanceof Error ? error.message : String(error)}`);
      });
  }

  private async sync(): Promise<void> {
    const plotly = this.plotly;
    if (!plotly || this.destroyed) return;
    const element = this.plot().nativeElement;
    const feed = untracked(this.feed);
    const horizon = untracked(this.horizon);
    const closedForm = untracked(this.closedForm);

    if (feed.run !== this.drawnRun || horizon !== this.drawnHorizon || closedForm !== this.drawnClosedForm) {
      const all = joinBatches(feed.batches, 0, feed.size);
      // The twin stays trace 0 so extendTraces below can append to it.
      const traces: Data[] = [{ type: 'scatter', mode: 'lines', name: 'twin', x: all.t, y: all.angle, line: { color: TRACE_COLOR, width: 2 } }];
      if (closedForm) {
        traces.push({
          type: 'scatter',
          mode: 'lines',
          name: 'closed form',
          x: closedForm.t,
          y: closedForm.angle,
          line: { color: CLOSED_FORM_COLOR, width: 2, dash: 'dash' },
        });
      }
      const layout = this.layout(horizon, [all.angle, ...(closedForm ? [closedForm.angle] : [])]);
      await plotly.react(element, traces, layout, PLOT_CONFIG);
      this.drawnLayout = layout;
      this.drawnRun = feed.run;
      this.drawnHorizon = horizon;
      this.drawnBatches = feed.size;
      this.drawnClosedForm = closedForm;
      this.drawnSamples.set(all.t.length);
      this.drawnClosedFormSamples.set(closedForm ? closedForm.t.length : 0);
      return;
    }

    if (feed.size > this.drawnBatches) {
      const added = joinBatches(feed.batches, this.drawnBatches, feed.size);
      await plotly.extendTraces(element, { x: [added.t], y: [added.angle] }, [0]);
      this.drawnBatches = feed.size;
      this.drawnSamples.update((count) => count + added.t.length);
      // A runaway twin leaves the axis's range: clip it now rather than at the next full draw.
      if (angleAxis([added.angle]).clipped) {
        const all = joinBatches(feed.batches, 0, feed.size);
        const layout = this.layout(horizon, [all.angle, ...(closedForm ? [closedForm.angle] : [])]);
        await plotly.relayout(element, { yaxis: layout.yaxis } as Partial<Layout>);
        this.drawnLayout = layout;
      }
    }
  }

  /** The plot's layout: the horizon on x; angle autoscaled unless a trace leaves ±ANGLE_AXIS_LIMIT. */
  private layout(horizon: number, angles: readonly ArrayLike<number>[]): Partial<Layout> {
    const axis = angleAxis(angles);
    this.axisText.set(axis.clipped ? axis.note : null);
    return {
      margin: { l: 64, r: 16, t: 32, b: 48 },
      xaxis: { title: { text: 'time (s)' }, range: [0, horizon], autorange: false, zeroline: false, exponentformat: 'e' },
      yaxis: axis.clipped
        ? { title: { text: `angle (rad, clipped at ±${ANGLE_AXIS_LIMIT})` }, range: axis.range, autorange: false, exponentformat: 'e' }
        : { title: { text: 'angle (rad)' }, autorange: true, exponentformat: 'e' },
      paper_bgcolor: 'rgba(0,0,0,0)',
      plot_bgcolor: 'rgba(0,0,0,0)',
      font: { family: 'Roboto, system-ui, sans-serif' },
      showlegend: true,
      legend: { orientation: 'h', x: 0, y: 1.02, yanchor: 'bottom' },
    };
  }
}
