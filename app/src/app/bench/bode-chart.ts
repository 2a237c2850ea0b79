import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, effect, inject, input, signal, untracked, viewChild } from '@angular/core';
import type { FrequencyResponse } from '@kinetwin/shared/frequency/frequency-response';
import { bodeFigure } from './bode-figure';
import type { MeasuredOverlay } from './sweep-readout';

type Plotly = typeof import('plotly.js-dist-min').default;

/**
 * The Bode chart of the frequency panel: magnitude above phase on one log frequency axis, drawn
 * with Plotly (imported on first use, as the angle chart does, so it stays out of the first
 * page's bundle). Each new response or measured overlay redraws the figure with Plotly.react. The host's
 * `data-traces` attribute counts the traces on the plot (0 before the first draw).
 */
@Component({
  selector: 'kt-bode-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { 'data-test': 'bode-chart', '[attr.data-traces]': 'traces()' },
  template: `
    <div #plot class="plot" role="img" aria-label="Magnitude in decibels and phase in degrees against angular frequency in radians per second, log axis"></div>
    @if (failure(); as message) {
      <p class="chart-failure">{{ message }}</p>
    }
  `,
  styleUrl: './bode-chart.css',
})
export class BodeChart {
  /** The response to draw; null leaves the last drawing as it is. */
  readonly response = input<FrequencyResponse | null>(null);
  /** The twin's measured points to draw over their path, or null for none. */
  readonly measured = input<MeasuredOverlay | null>(null);

  private readonly plot = viewChild.required<ElementRef<HTMLDivElement>>('plot');
  private readonly drawnTraces = signal(0);
  protected readonly traces = this.drawnTraces.asReadonly();
  private readonly failureText = signal<string | null>(null);
  protected readonly failure = this.failureText.asReadonly();

  private plotly: Plotly | null = null;
  private destroyed = false;
  private drawn: { response: FrequencyResponse; measured: MeasuredOverlay | null } | null = null;
  /** Plot calls run one after another; a queued draw takes the newest response when it runs. */
  private queue: Promise<void> = Promise.resolve();
  private drawQueued = false;

  constructor() {
    afterNextRender(async () => {
      try {
        this.plotly = (await import('plotly.js-dist-min')).default;
      } catch {
        this.failureText.set('The Bode chart could not be loaded. Reload the page to try again.');
        return;
      }
      this.scheduleDraw();
    });

    effect(() => {
      this.response();
      this.measured();
      this.scheduleDraw();
    });

    inject(DestroyRef).onDestroy(() => {
      this.destroyed = true;
      if (this.plotly) this.plotly.purge(this.plot().nativeElement);
    });
  }

  private scheduleDraw(): void {
    if (!this.plotly || this.drawQueued) return;
    this.drawQueued = true;
    this.queue = this.queue
      .then(() => {
        this.drawQueued = false;
        return this.draw();
      })
      .catch((error: unknown) => {
        this.failureText.set(`The Bode chart stopped drawing: ${error instanceof Error ? error.message : String(error)}`);
      });
  }

  private async draw(): Promise<void> {
    const plotly = this.plotly;
    const response = untracked(this.response);
    const measured = untracked(this.measured);
    if (!plotly || this.destroyed || response === null || (response === this.drawn?.response && measured === this.drawn.measured)) return;
    const figure = bodeFigure(response, measured);
    await plotly.react(this.plot().nativeElement, figure.data, figure.layout, { responsive: true, displaylogo: false });
    this.drawn = { response, measured };
    this.drawnTraces.set(figure.data.length);
  }
}
