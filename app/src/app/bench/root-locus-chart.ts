import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, effect, inject, input, signal, untracked, viewChild } from '@angular/core';
import type { RootLocus } from '@kinetwin/shared/frequency/root-locus';
import { ChartControls } from './chart-controls';
import { LazyPlot } from './lazy-plot';
import { locusFigure } from './root-locus-figure';


/**
 * The s-plane plot of the root-locus panel, drawn with Plotly imported on first use (as the
 * Bode chart does, so it stays out of the first page's bundle). The host's `data-traces`
 * attribute counts the traces on the plot (0 before the first draw).
 */
@Component({
  selector: 'kt-root-locus-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ChartControls],
  host: { 'data-test': 'root-locus-chart', '[attr.data-traces]': 'traces()' },
  template: `
    <kt-chart-controls [actions]="lazy.actions" chartName="root locus" fileName="root-locus" />
    <div #plot class="plot" role="img" aria-label="Closed-loop poles in the s-plane, real part against imaginary part, as one gain varies"></div>
    @if (failure(); as message) {
      <p class="chart-failure">{{ message }}</p>
    }
  `,
  styleUrl: './bode-chart.css',
})
export class RootLocusChart {
  /** The locus to draw; null leaves the last drawing as it is. */
  readonly locus = input<RootLocus | null>(null);

  private readonly plot = viewChild.required<ElementRef<HTMLDivElement>>('plot');
  private readonly drawnTraces = signal(0);
  protected readonly traces = this.drawnTraces.asReadonly();
  private readonly failureText = signal<string | null>(null);
  protected readonly failure = this.failureText.asReadonly();

  protected readonly lazy = new LazyPlot(
    () => this.plot().nativeElement,
    () => {
      const locus = untracked(this.locus);
      return locus === null ? null : { key: [locus], figure: () => locusFigure(locus) };
    },
    (traces) => this.drawnTraces.set(traces),
    (message) => this.failureText.set(message),
    'root-locus plot',
  );

  constructor() {
    afterNextRender(() => this.lazy.load());
    effect(() => {
      this.locus();
      this.lazy.request();
    });
    inject(DestroyRef).onDestroy(() => this.lazy.destroy());
  }
}
