import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, effect, inject, input, signal, untracked, viewChild } from '@angular/core';
import type { FrequencyResponse } from '@kinetwin/shared/frequency/frequency-response';
import { bodeFigure } from './bode-figure';
import { ChartControls } from './chart-controls';
import { LazyPlot } from './lazy-plot';
import type { MeasuredOverlay } from './sweep-readout';


/**
 * The Bode chart of the frequency panel: magnitude above phase on one log frequency axis, drawn
 * with Plotly (imported on first use, as the angle chart does, so it stays out of the first
 * page's bundle). Each new response or measured overlay redraws the figure with Plotly.react. The host's
 * `data-traces` attribute counts the traces on the plot (0 before the first draw).
 */
@Component({
  selector: 'kt-bode-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ChartControls],
  host: { 'data-test': 'bode-chart', '[attr.data-traces]': 'traces()' },
  template: `
    <kt-chart-controls [actions]="lazy.actions" chartName="Bode" fileName="bode-chart" />
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

  protected readonly lazy = new LazyPlot(
    () => this.plot().nativeElement,
    () => {
      const response = untracked(this.response);
      const measured = untracked(this.measured);
      return response === null ? null : { key: [response, measured], figure: () => bodeFigure(response, measured) };
    },
    (traces) => this.drawnTraces.set(traces),
    (message) => this.failureText.set(message),
    'Bode chart',
  );

  constructor() {
    afterNextRender(() => this.lazy.load());
    effect(() => {
      this.response();
      this.measured();
      this.lazy.request();
    });
    inject(DestroyRef).onDestroy(() => this.lazy.destroy());
  }
}
