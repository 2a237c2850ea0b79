import type { Complex } from '@kinetwin/shared/closed-form/complex-number';
import type { RootLocus } from '@kinetwin/shared/frequency/root-locus';
import type { Layout, ScatterData, Shape } from 'plotly.js-dist-min';
import { poleText } from './closed-form-readout';
import { formatQuantity } from './scenario-facts';

/** What the root-locus chart hands to Plotly, built without Plotly so it can be tested. */
export interface LocusFigure {
  data: Partial<ScatterData>[];
  layout: Partial<Layout>;
}

/** Branch colour: the app's primary 40 (app/src/_theme-colors.scss); one legend entry for all branches. */
const BRANCH_COLOR = '#146871';
/** Current poles and the axes: the neutral palette's tones 20 and 60. */
const MARKER_COLOR = '#293234';
const AXIS_COLOR = '#899294';

/** Relative size below which a real part counts as on the imaginary axis (root-finding noise). */
const AXIS_TOLERANCE = 1e-9;

const rightOfAxis = (p: Complex) => p.re > AXIS_TOLERANCE * Math.max(1, Math.hypot(p.re, p.im));

/**
 * The s-plane plot of a locus: each branch (pole j across the gain values) as a line, open circles
 * where the range starts, the draft's own poles as filled diamonds, the imaginary axis as a solid
 * line (right of it: unstable) and the real axis dashed.
 */
export function locusFigure(locus: RootLocus): LocusFigure {
  const branches = locus.poles[0]?.length ?? 0;
  const data: Partial<ScatterData>[] = [];
  const valueText = (v: number) => `${locus.gain} = ${formatQuantity(v)}`;
  for (let j = 0; j < branches; j++) {
    data.push({
      type: 'scatter',
      mode: 'lines',
      name: `branch ${j + 1}`,
      legendgroup: 'branches',
      showlegend: j === 0,
      x: locus.poles.map((poles) => poles[j]!.re),
      y: locus.poles.map((poles) => poles[j]!.im),
      customdata: locus.values,
      line: { color: BRANCH_COLOR, width: 2 },
      hovertemplate: `${locus.gain} = %{customdata:.4g}<br>s = %{x:.4g} %{y:+.4g}j<extra></extra>`,
    });
  }
  if (branches > 0) {
    data[0]!.name = 'branches';
    data.push({
      type: 'scatter',
      mode: 'markers',
      name: `start, ${valueText(locus.values[0]!)}`,
      x: locus.poles[0]!.map((p) => p.re),
      y: locus.poles[0]!.map((p) => p.im),
      marker: { symbol: 'circle-open', size: 9, color: MARKER_COLOR, line: { width: 2 } },
      hovertemplate: `${valueText(locus.values[0]!)}<br>s = %{x:.4g} %{y:+.4g}j<extra></extra>`,
    });
  }
  data.push({
    type: 'scatter',
    mode: 'markers',
    name: `poles at ${valueText(locus.current.value)}`,
    x: locus.current.poles.map((p) => p.re),
    y: locus.current.poles.map((p) => p.im),
    marker: { symbol: 'diamond', size: 11, color: MARKER_COLOR },
    hovertemplate: `draft's ${valueText(locus.current.value)}<br>s = %{x:.4g} %{y:+.4g}j<extra></extra>`,
  });
  const shapes: Partial<Shape>[] = [
    { type: 'line', xref: 'x', yref: 'paper', x0: 0, x1: 0, y0: 0, y1: 1, line: { color: MARKER_COLOR, width: 1.5 } },
    { type: 'line', xref: 'paper', yref: 'y', x0: 0, x1: 1, y0: 0, y1: 0, line: { color: AXIS_COLOR, width: 1, dash: 'dash' } },
  ];
  return {
    data,
    layout: {
      margin: { l: 64, r: 16, t: 40, b: 48 },
      xaxis: { title: { text: 'real part σ (1/s)' }, zeroline: false, autorange: true, exponentformat: 'e' },
      yaxis: { title: { text: 'imaginary part ω (rad/s)' }, zeroline: false, autorange: true, exponentformat: 'e' },
      shapes,
      hovermode: 'closest',
      paper_bgcolor: 'rgba(0,0,0,0)',
      plot_bgcolor: 'rgba(0,0,0,0)',
      font: { family: 'Roboto, system-ui, sans-serif' },
      showlegend: true,
      legend: { orientation: 'h', x: 0, y: 1.02, yanchor: 'bottom' },
    },
  };
}

/** The locus in words: the draft's poles and where the loop changes stability along the range. */
export interface LocusReadout {
  /** e.g. "Poles at kp = 6 (the draft's)". */
  currentLabel: string;
  /** One line per pole, a conjugate pair on one line, as the closed-form panel writes them. */
  currentPoles: { key: string; text: string }[];
  /** e.g. "unstable from kp between 41.2 and 41.5 on". */
  changes: string[];
  /** Which way the range runs and how it is sampled. */
  range: string;
}

export function locusReadout(locus: RootLocus, spacing: 'linear' | 'log'): LocusReadout {
  const values = locus.values;
  const stable = locus.poles.map((poles) => !poles.some(rightOfAxis));
  const changes: string[] = [];
  for (let i = 1; i < stable.length; i++) {
    if (stable[i] === stable[i - 1]) continue;
    const between = `between ${locus.gain} = ${formatQuantity(values[i - 1]!)} and ${formatQuantity(values[i]!)}`;
    changes.push(stable[i] ? `A pole crosses back into the left half-plane ${between}: the loop turns stable.` : `A pole crosses into the right half-plane ${between}: the loop turns unstable.`);
  }
  if (changes.length === 0) changes.push(stable[0] ? 'Every pole stays left of the imaginary axis over the whole range: the loop is stable throughout.' : 'A pole stays right of the imaginary axis over the whole range: the loop is unstable throughout.');
  return {
    currentLabel: `Poles at ${locus.gain} = ${formatQuantity(locus.current.value)} (the draft's)`,
    currentPoles: locus.current.poles
      .filter((p) => p.im >= 0)
      .sort((a, b) => b.re - a.re || a.im - b.im)
      .map((p, i) => ({ key: String(i), text: poleText({ re: p.re, im: p.im, multiplicity: 1 }) })),
    changes,
    range: `${locus.gain} from ${formatQuantity(values[0]!)} to ${formatQuantity(values.at(-1)!)}, ${values.length} values, ${spacing} spacing; the other gains held at the draft's.`,
  };
}
