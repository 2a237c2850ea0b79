import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, effect, inject, input, signal, untracked, viewChild } from '@angular/core';
import type { RootLocus } from '@kinetwin/shared/frequency/root-locus';
import { locusFigure } from './root-locus-figure';

type Plotly = typeof import('plotly.js-dist-min').default;

/**
 * The s-plane plot of the root-locus panel, drawn with Plotly imported on first use (as the
 * Bode chart does, so it stays out of the first page's bundle). The host's `data-traces`
 * attribute counts the traces on the plot (0 before the first draw).
 */
@Component({
  selector: 'kt-root-locus-chart',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { 'data-test': 'root-locus-chart', '[attr.data-traces]': 'traces()' },
  template: `
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

  private plotly: Plotly | null = null;
  private destroyed = false;
  private drawn: RootLocus | null = null;
  /** Plot calls run one after another; a queued draw takes the newest locus when it runs. */
  private queue: Promise<void> = Promise.resolve();
  private drawQueued = false;

  constructor() {
    afterNextRender(async () => {
      try {
        this.plotly = (await import('plotly.js-dist-min')).default;
      } catch {
        this.failureText.set('The root-locus plot could not be loaded. Reload the page to try again.');
        return;
      }
      this.scheduleDraw();
    });

    effect(() => {
      this.locus();
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
        this.failureText.set(`The root-locus plot stopped drawing: ${error instanceof Error ? error.message : String(error)}`);
      });
  }

  private async draw(): Promise<void> {
    const plotly = this.plotly;
    const locus = untracked(this.locus);
    if (!plotly || this.destroyed || locus === null || locus === this.drawn) return;
    const figure = locusFigure(locus);
    await plotly.react(this.plot().nativeElement, figure.data, figure.layout, { responsive: true, displaylogo: false });
    this.drawn = locus;
    this.drawnTraces.set(figure.data.length);
  }
}
