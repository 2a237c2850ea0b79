import type { Config, Layout } from 'plotly.js-dist-min';

type Plotly = typeof import('plotly.js-dist-min').default;

/**
 * Plotly's options for every chart of the app: no stock mode bar (its buttons are the library's,
 * and its "share" offered to upload the chart to an outside service) and no cloud button; our own
 * controls (chart-controls.ts) zoom, pan, reset and export, all on this machine.
 */
export const PLOT_CONFIG: Partial<Config> = {
  responsive: true,
  displaylogo: false,
  displayModeBar: false,
  showSendToCloud: false,
};

/** What a chart's own controls can do to it. */
export interface ChartActions {
  /** What a drag on the plot does. */
  dragMode(mode: 'zoom' | 'pan'): Promise<void>;
  /** Back to the view the chart drew (its axes' own ranges or autoscale). */
  reset(): Promise<void>;
  /** Saves the chart as a PNG file, rendered in this browser (nothing leaves the machine). */
  exportPng(fileName: string): Promise<void>;
}

/**
 * The axis settings that undo a zoom or pan: each axis of the drawn layout back to its own range
 * (or autoscale when it had none).
 * @example resetView({ xaxis: { range: [0, 2], autorange: false }, yaxis: {} }) // { 'xaxis.range': [0, 2], 'xaxis.autorange': false, 'yaxis.autorange': true }
 */
export function resetView(layout: Partial<Layout>): Record<string, unknown> {
  const update: Record<string, unknown> = {};
  for (const [key, axis] of Object.entries(layout)) {
    if (!/^[xy]axis\d*$/.test(key) || axis === null || typeof axis !== 'object') continue;
    const { range, autorange } = axis as { range?: unknown; autorange?: unknown };
    if (Array.isArray(range) && autorange === false) {
      update[`${key}.range`] = [...range];
      update[`${key}.autorange`] = false;
    } else {
      update[`${key}.autorange`] = true;
    }
  }
  return update;
}

/** The actions on one Plotly element, given the layout it was last drawn with (null before a draw). */
export function plotlyChartActions(plotly: () => Plotly | null, element: () => HTMLElement, drawnLayout: () => Partial<Layout> | null): ChartActions {
  return {
    async dragMode(mode) {
      const p = plotly();
      if (p && drawnLayout()) await p.relayout(element(), { dragmode: mode });
    },
    async reset() {
      const p = plotly();
      const layout = drawnLayout();
      // Plotly takes dotted attribute paths, which its Layout type does not list.
      if (p && layout) await p.relayout(element(), resetView(layout) as Partial<Layout>);
    },
    async exportPng(fileName) {
      const p = plotly();
      if (p && drawnLayout()) await p.downloadImage(element(), { format: 'png', filename: fileName, width: element().clientWidth || 960, height: element().clientHeight || 480 });
    },
  };
}
