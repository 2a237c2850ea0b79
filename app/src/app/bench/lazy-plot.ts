import type { Layout, ScatterData } from 'plotly.js-dist-min';
import { type ChartActions, PLOT_CONFIG, plotlyChartActions } from './chart-actions';

type Plotly = typeof import('plotly.js-dist-min').default;

/** What a chart draws: Plotly's figure, and a key that says whether it changed since the last draw. */
export interface PlotRequest {
  /** Compared with === against the last drawn key; equal means nothing to redraw. */
  key: readonly unknown[];
  figure: () => { data: Partial<ScatterData>[]; layout: Partial<Layout> };
}

/**
 * One Plotly plot in one element, Plotly imported on first use so it stays out of the first
 * page's bundle. Draws run one after another (Plotly.react is asynchronous); a draw that waits
 * takes the newest request when it runs, so a burst of changes costs one redraw. The Bode chart
 * and the root-locus plot share it.
 */
export class LazyPlot {
  private plotly: Plotly | null = null;
  private destroyed = false;
  private drawnKey: readonly unknown[] | null = null;
  private drawnLayout: Partial<Layout> | null = null;
  /** Zoom, pan, reset and PNG export for the chart's own controls. */
  readonly actions: ChartActions = plotlyChartActions(() => this.plotly, () => this.element(), () => this.drawnLayout);
  private queue: Promise<void> = Promise.resolve();
  private drawQueued = false;

  constructor(
    private readonly element: () => HTMLElement,
    /** The newest request, or null to leave the drawing as it is. */
    private readonly current: () => PlotRequest | null,
    private readonly drawn: (traces: number) => void,
    private readonly failed: (message: string) => void,
    /** The plot's name in messages, e.g. "Bode chart". */
    private readonly what: string,
  ) {}

  /** Loads Plotly, then draws the current request; a failure to load is said, not thrown. */
  async load(): Promise<void> {
    try {
      this.plotly = (await import('plotly.js-dist-min')).default;
    } catch {
      this.failed(`The ${this.what} could not be loaded. Reload the page to try again.`);
      return;
    }
    this.request();
  }

  /** Asks for a draw of the current request (once Plotly is there). */
  request(): void {
    if (!this.plotly || this.drawQueued) return;
    this.drawQueued = true;
    this.queue = this.queue
      .then(() => {
        this.drawQueued = false;
        return this.draw();
      })
      .catch((error: unknown) => this.failed(`The ${this.what} stopped drawing: ${error instanceof Error ? error.message : String(error)}`));
  }

  destroy(): void {
    this.destroyed = true;
    if (this.plotly) this.plotly.purge(this.element());
  }

  private async draw(): Promise<void> {
    const plotly = this.plotly;
    const next = this.current();
    if (!plotly || this.destroyed || next === null || (this.drawnKey !== null && sameKey(next.key, this.drawnKey))) return;
    const figure = next.figure();
    await plotly.react(this.element(), figure.data, figure.layout, PLOT_CONFIG);
    this.drawnKey = next.key;
    this.drawnLayout = figure.layout;
    this.drawn(figure.data.length);
  }
}

function sameKey(a: readonly unknown[], b: readonly unknown[]): boolean {
  return a.length === b.length && a.every((x, i) => x === b[i]);
}
