import type { TwinScenario } from '../twin/recorded-samples';
import { simulateTwin, type TwinOptions } from '../twin/twin-run';
import { FIT_PARAMETERS } from './fit-parameters';
import type { CheckedFitRequest } from './fit-request';

/**
 * The twin as a least-squares model: parameters in, the twin's angle (and velocity) at the
 * measured times of the window out, each channel divided by its weight so angle and velocity
 * residuals are comparable numbers. The twin runs from 0 to the window's end on an output grid
 * as fine as the log (a quarter of its spacing when the log is unevenly sampled) and is read at
 * the measured times by linear interpolation between grid points.
 */
export interface FitModel {
  /** The weighted measurements: the window's angles, then its velocities when fitted. */
  data: Float64Array;
  model(p: readonly number[]): Float64Array | { failed: string };
  /** The scenario the twin runs at parameters p. */
  scenarioAt(p: readonly number[]): TwinScenario;
  /** Samples per channel in the window. */
  count: number;
  /** Output spacing of the twin, s. */
  dt: number;
}

/** Divisors of each channel's residuals. */
export interface ChannelWeights {
  angle: number;
  velocity: number;
}

/** Relative spread of the spacings under which a log counts as evenly sampled. */
const EVEN_SPACING = 1e-3;

/** The twin's output spacing for the window's samples. */
function outputSpacing(t: Float64Array, first: number, last: number): number {
  const gaps: number[] = [];
  for (let i = Math.max(first, 1); i <= last; i++) gaps.push(t[i]! - t[i - 1]!);
  gaps.sort((a, b) => a - b);
  const median = gaps[gaps.length >> 1]!;
  const even = gaps[0]! >= median * (1 - EVEN_SPACING) && gaps[gaps.length - 1]! <= median * (1 + EVEN_SPACING);
  return even ? median : median / 4;
}

/** The run's base scenario: horizon at the window's end, initial state from the log when asked. */
function baseScenario(request: CheckedFitRequest): TwinScenario {
  const { scenario, measured, window } = request;
  const initial =
    request.initialState === 'log' ? { angle: measured.angle[0]!, velocity: measured.velocity ? measured.velocity[0]! : scenario.initial.velocity } : scenario.initial;
  return { ...scenario, horizon: window.end, initial };
}

export function createFitModel(request: CheckedFitRequest, weights: ChannelWeights, twinOptions: TwinOptions = {}): FitModel {
  const { measured, first, last, parameters } = request;
  const count = last - first + 1;
  const withVelocity = measured.velocity !== undefined;
  const dt = outputSpacing(measured.t, first, last);
  const base = baseScenario(request);
  const lastGrid = Math.floor(base.horizon / dt + 1e-9);
  // Where each measured time falls on the grid: index below it and the fraction beyond.
  const below = new Int32Array(count);
  const frac = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const u = measured.t[first + i]! / dt;
    let k = Math.floor(u + 1e-9);
    if (k >= lastGrid) k = lastGrid;
    below[i] = k;
    frac[i] = k >= lastGrid ? 0 : Math.max(0, u - k);
  }
  const data = new Float64Array(withVelocity ? 2 * count : count);
  for (let i = 0; i < count; i++) {
    data[i] = measured.angle[first + i]! / weights.angle;
    if (withVelocity) data[count + i] = measured.velocity![first + i]! / weights.velocity;
  }
  const scenarioAt = (p: readonly number[]) => parameters.reduce((s, name, j) => FIT_PARAMETERS[name].set(s, p[j]!), base);
  const options: TwinOptions = { ...twinOptions, dt };
  return {
    data,
    count,
    dt,
    scenarioAt,
    model(p) {
      const run = simulateTwin(scenarioAt(p), options);
      if (run.stop) return { failed: run.stop.message };
      const { angle, velocity } = run.samples;
      if (angle.length <= lastGrid) return { failed: `the twin stopped at ${run.samples.t[angle.length - 1] ?? 0} s, before the window's end` };
      const out = new Float64Array(data.length);
      for (let i = 0; i < count; i++) {
        const k = below[i]!;
        const f = frac[i]!;
        const a = f === 0 ? angle[k]! : angle[k]! + f * (angle[k + 1]! - angle[k]!);
        out[i] = a / weights.angle;
        if (withVelocity) out[count + i] = (f === 0 ? velocity[k]! : velocity[k]! + f * (velocity[k + 1]! - velocity[k]!)) / weights.velocity;
      }
      return out;
    },
  };
}
