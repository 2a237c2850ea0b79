import type { BodeSeries, FrequencyResponse } from '@kinetwin/shared/frequency/frequency-response';
import type { Annotation, Layout, ScatterData, Shape } from 'plotly.js-dist-min';
import { formatDegrees, PATH_NAMES } from './frequency-readout';
import { formatQuantity } from './scenario-facts';
import type { MeasuredOverlay } from './sweep-readout';

/** What the Bode chart hands to Plotly: traces and layout, built without Plotly so they can be tested. */
export interface BodeFigure {
  data: Partial<ScatterData>[];
  layout: Partial<Layout>;
}

/**
 * Line styles of the three paths, from the app's theme palettes (app/src/_theme-colors.scss):
 * primary 40, tertiary 50 and secondary 30, told apart by dash as well as colour.
 */
const PATH_STYLE = {
  loop: { color: '#146871', dash: 'solid' },
  referenceToAngle: { color: '#ac6620', dash: 'dash' },
  torqueToAngle: { color: '#324b4e', dash: 'dot' },
} as const;
/** Crossover markers and reference lines: the neutral palette's tones 20 and 60. */
const MARKER_COLOR = '#293234';
const REFERENCE_COLOR = '#899294';

type PathKey = keyof typeof PATH_STYLE;

/** Magnitude panel on top, phase panel below, on one shared frequency axis (fractions of the plot height). */
const MAGNITUDE_DOMAIN: [number, number] = [0.55, 1];
const PHASE_DOMAIN: [number, number] = [0, 0.45];

/**
 * The value of a series at w, linear in log ω between the grid points around it; null outside
 * the grid or next to a gap.
 */
export function valueAtFrequency(frequency: readonly number[], values: readonly (number | null)[], w: number): number | null {
  if (frequency.length === 0 || !(w >= frequency[0]!) || !(w <= frequency[frequency.length - 1]!)) return null;
  let i = 0;
  while (i + 1 < frequency.length - 1 && frequency[i + 1]! < w) i++;
  const [wa, wb] = [frequency[i]!, frequency[i + 1] ?? frequency[i]!];
  const [va, vb] = [values[i], values[i + 1] ?? values[i]];
  if (va === null || va === undefined || vb === null || vb === undefined) return null;
  if (wb === wa) return va;
  const s = Math.log(w / wa) / Math.log(wb / wa);
  return va + s * (vb - va);
}

/** The two traces of one path: magnitude on the top panel (in the legend), phase below (grouped with it). */
function pathTraces(key: PathKey, series: BodeSeries, frequency: number[]): Partial<ScatterData>[] {
  const name = PATH_NAMES[key];
  const line = { color: PATH_STYLE[key].color, dash: PATH_STYLE[key].dash, width: 2 };
  // Each point carries the other panel's value, so one hover reads frequency, magnitude and phase.
  const hover = (magnitude: string, phase: string) => `${name}<br>ω = %{x:.4g} rad/s<br>magnitude ${magnitude} dB<br>phase ${phase}°<extra></extra>`;
  return [
    {
      type: 'scatter',
      mode: 'lines',
      name,
      legendgroup: key,
      x: frequency,
      y: series.magnitudeDb,
      customdata: series.phaseDeg,
      xaxis: 'x',
      yaxis: 'y',
      line,
      connectgaps: false,
      hovertemplate: hover('%{y:.4g}', '%{customdata:.4g}'),
    },
    {
      type: 'scatter',
      mode: 'lines',
      name,
      legendgroup: key,
      showlegend: false,
      x: frequency,
      y: series.phaseDeg,
      customdata: series.magnitudeDb,
      xaxis: 'x',
      yaxis: 'y2',
      line,
      connectgaps: false,
      hovertemplate: hover('%{customdata:.4g}', '%{y:.4g}'),
    },
  ];
}

/** The twin's measured points as markers on both panels, in their path's colour; faded when stale. */
function measuredTraces(measured: MeasuredOverlay): Partial<ScatterData>[] {
  const name = measured.stale ? 'measured (twin, stale)' : 'measured (twin)';
  const marker = { symbol: 'circle', size: 8, color: PATH_STYLE[measured.path].color, line: { color: MARKER_COLOR, width: 1 } };
  const opacity = measured.stale ? 0.35 : 1;
  const custom = measured.frequency.map((_, i) => [measured.magnitudeDb[i] ?? null, measured.phaseDeg[i] ?? null, measured.distortion[i] === null ? null : measured.distortion[i]! * 100]);
  const hovertemplate = `${name}, ${PATH_NAMES[measured.path]}<br>ω = %{x:.4g} rad/s<br>magnitude %{customdata[0]:.4g} dB<br>phase %{customdata[1]:.4g}°<br>distortion %{customdata[2]:.3g} %<extra></extra>`;
  const common = { type: 'scatter', mode: 'markers', legendgroup: 'measured', x: measured.frequency, customdata: custom, xaxis: 'x', marker, opacity, hovertemplate } as const;
  return [
    { ...common, name, y: measured.magnitudeDb, yaxis: 'y' } as Partial<ScatterData>,
    { ...common, name, showlegend: false, y: measured.phaseDeg, yaxis: 'y2' } as Partial<ScatterData>,
  ];
}

/** A dotted vertical line through both panels at a crossover, labelled at the top of the magnitude panel. */
function crossoverLine(w: number, label: string): { shape: Partial<Shape>; annotation: Partial<Annotation> } {
  return {
    shape: { type: 'line', xref: 'x', yref: 'paper', x0: w, x1: w, y0: 0, y1: 1, line: { color: MARKER_COLOR, width: 1, dash: 'dot' } },
    // Annotations on a log axis take log10 of the frequency; shapes take the frequency itself.
    annotation: { xref: 'x', yref: 'paper', x: Math.log10(w), y: 1, xanchor: 'left', yanchor: 'top', xshift: 3, text: label, showarrow: false, font: { size: 11, color: MARKER_COLOR } },
  };
}

/** A horizontal reference line across one panel. */
function levelLine(yref: 'y' | 'y2', y: number): Partial<Shape> {
  return { type: 'line', xref: 'paper', yref, x0: 0, x1: 1, y0: y, y1: y, line: { color: REFERENCE_COLOR, width: 1, dash: 'dash' } };
}

/**
 * The Bode chart of a response: magnitude (dB) above phase (°) against ω on a log axis, one
 * legend entry per path (a null cell is a gap in its line), the gain crossover marked at 0 dB and
 * the phase crossover on the loop's phase, 0 dB and −180° reference lines. A crossover outside
 * the grid is left off the chart (the read-out still gives it). The twin's measured points, when
 * given, are markers over the curves of the path they measure (left off when the response has no
 * such path, e.g. a reference sweep over an open-loop draft).
 */
export function bodeFigure(response: FrequencyResponse, measured: MeasuredOverlay | null = null): BodeFigure {
  const { frequency, margins } = response;
  const data: Partial<ScatterData>[] = [];
  if (response.loop) data.push(...pathTraces('loop', response.loop, frequency));
  if (response.referenceToAngle) data.push(...pathTraces('referenceToAngle', response.referenceToAngle, frequency));
  data.push(...pathTraces('torqueToAngle', response.torqueToAngle, frequency));
  if (measured && response[measured.path]) data.push(...measuredTraces(measured));

  const shapes: Partial<Shape>[] = [levelLine('y', 0), levelLine('y2', -180)];
  const annotations: Partial<Annotation>[] = [];
  const inGrid = (w: number | null): w is number => w !== null && w >= frequency[0]! && w <= frequency[frequency.length - 1]!;
  const loop = response.loop;
  const gain = margins.gainCrossover;
  if (loop && inGrid(gain)) {
    const line = crossoverLine(gain, 'gain crossover');
    shapes.push(line.shape);
    annotations.push(line.annotation);
    const margin = margins.phaseMarginDeg === null ? '—' : formatDegrees(margins.phaseMarginDeg);
    data.push({
      type: 'scatter',
      mode: 'markers',
      name: 'gain crossover',
      x: [gain],
      y: [0],
      xaxis: 'x',
      yaxis: 'y',
      marker: { symbol: 'circle-open', size: 10, color: MARKER_COLOR, line: { width: 2 } },
      hovertemplate: `gain crossover<br>ω = %{x:.4g} rad/s<br>phase margin ${margin}<extra></extra>`,
    });
  }
  const phase = margins.phaseCrossover;
  if (loop && inGrid(phase)) {
    const line = crossoverLine(phase, 'phase crossover');
    shapes.push(line.shape);
    annotations.push(line.annotation);
    // The unwrapped phase sits on −180° or a turn below it there: mark the loop's own curve.
    const level = valueAtFrequency(frequency, loop.phaseDeg, phase);
    const margin = margins.gainMarginDb === null ? '—' : formatQuantity(margins.gainMarginDb, 'dB');
    if (level !== null) {
      data.push({
        type: 'scatter',
        mode: 'markers',
        name: 'phase crossover',
        x: [phase],
        y: [level],
        xaxis: 'x',
        yaxis: 'y2',
        marker: { symbol: 'diamond-open', size: 10, color: MARKER_COLOR, line: { width: 2 } },
        hovertemplate: `phase crossover<br>ω = %{x:.4g} rad/s<br>gain margin ${margin}<extra></extra>`,
      });
    }
  }

  return {
    data,
    layout: {
      margin: { l: 64, r: 16, t: 40, b: 48 },
      xaxis: {
        type: 'log',
        title: { text: 'frequency ω (rad/s)' },
        anchor: 'y2',
        range: [Math.log10(frequency[0]!), Math.log10(frequency[frequency.length - 1]!)],
        autorange: false,
        exponentformat: 'e',
        showspikes: true,
        spikemode: 'across',
        spikethickness: 1,
        spikecolor: REFERENCE_COLOR,
      },
      yaxis: { title: { text: 'magnitude (dB)' }, domain: MAGNITUDE_DOMAIN, autorange: true, zeroline: false, exponentformat: 'e' },
      yaxis2: { title: { text: 'phase (°)' }, domain: PHASE_DOMAIN, autorange: true, zeroline: false, exponentformat: 'e' },
      shapes,
      annotations,
      hovermode: 'closest',
      paper_bgcolor: 'rgba(0,0,0,0)',
      plot_bgcolor: 'rgba(0,0,0,0)',
      font: { family: 'Roboto, system-ui, sans-serif' },
      showlegend: true,
      legend: { orientation: 'h', x: 0, y: 1.02, yanchor: 'bottom' },
    },
  };
}
