import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, effect, inject, input, signal, untracked, viewChild } from '@angular/core';
import type { ChartFeed } from './chart-feed';
import { joinBatches } from './chart-feed';

type Plotly = typeof import('plotly.js-dist-min').default;

/** Line colour of the angle trace: the theme's primary tone 40. */
const TRACE_COLOR = '#146871';

/**
 * Angle against time for one run, drawn with Plotly (imported on first use so it stays out of the
 * first page's bundle). New batches are appended with extendTraces; a new run redraws from empty.
 * The host's `data-samples` attribute counts the samples on the plot.
 */
@Component({
  selector: 'kt-angle-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    'data-test': 'angle-chart',
    '[attr.data-samples]': 'samples()',
  },
  template: `
    <div #plot class="plot" role="img" aria-label="Joint angle in radians against time in seconds"></div>
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

  private readonly plot = viewChild.required<ElementRef<HTMLDivElement>>('plot');
  private readonly drawnSamples = signal(0);
  protected readonly samples = this.drawnSamples.asReadonly();
  private readonly failureText = signal<string | null>(null);
  protected readonly failure = this.failureText.asReadonly();

  private plotly: Plotly | null = null;
  private destroyed = false;
  /** What is on the plot now: which run, x range and how many of its batches. */
  private drawnRun = Number.NaN;
  private drawnHorizon = Number.NaN;
  private drawnBatches = 0;
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

    if (feed.run !== this.drawnRun || horizon !== this.drawnHorizon) {
      const all = joinBatches(feed.batches, 0, feed.size);
      await plotly.react(
        element,
        [{ type: 'scatter', mode: 'lines', name: 'angle', x: all.t, y: all.angle, line: { color: TRACE_COLOR, width: 2 } }],
        {
          margin: { l: 64, r: 16, t: 16, b: 48 },
          xaxis: { title: { text: 'time (s)' }, range: [0, horizon], autorange: false, zeroline: false },
          yaxis: { title: { text: 'angle (rad)' }, autorange: true },
          paper_bgcolor: 'rgba(0,0,0,0)',
          plot_bgcolor: 'rgba(0,0,0,0)',
          font: { family: 'Roboto, system-ui, sans-serif' },
          showlegend: false,
        },
        { responsive: true, displaylogo: false },
      );
      this.drawnRun = feed.run;
      this.drawnHorizon = horizon;
      this.drawnBatches = feed.size;
      this.drawnSamples.set(all.t.length);
      return;
    }

    if (feed.size > this.drawnBatches) {
      const added = joinBatches(feed.batches, this.drawnBatches, feed.size);
      await plotly.extendTraces(element, { x: [added.t], y: [added.angle] }, [0]);
      this.drawnBatches = feed.size;
      this.drawnSamples.update((count) => count + added.t.length);
    }
  }
}
