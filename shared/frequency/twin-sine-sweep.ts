import { lusolve } from 'mathjs';
import { polynomialRoots } from '../closed-form/polynomial-roots';
import { poleLocation } from '../closed-form/pole-location';
import { MAX_HORIZON_S, type InputChannel, type Scenario } from '../scenario/scenario-schema';
import { type Parsed } from '../validation/field-errors';
import { createTwinRun } from '../twin/twin-run';
import { frequencyResponseOf } from './frequency-response';
import { loopChannelsOf } from './loop-channels';

export { defaultSweepAmplitude, defaultSweepChannel } from './sweep-defaults';

/** Settings of a measured sweep; the README quotes the defaults. */
export const SINE_SWEEP_DEFAULTS = {
  /** Whole periods the fit is made over, after the transient has died out. */
  measuredPeriods: 4,
  /** Output samples per period of the injected sine. */
  samplesPerPeriod: 64,
  /** The transient is waited out until it has fallen to this fraction of its start: e^(−σ·t) ≤ 1e-6. */
  transientFraction: 1e-6,
  /** Fewest whole periods waited before the measurement, however fast the transient. */
  minSettlePeriods: 3,
  /** Frequencies one sweep may hold: each is a full twin run. */
  maxFrequencies: 200,
} as const;

/** One measured frequency: the fundamental of the twin's angle against the injected sine. */
export interface MeasuredPoint {
  /** rad/s */
  frequency: number;
  /** 20·log10(fundamental amplitude / injected amplitude); null when the point could not be measured. */
  magnitudeDb: number | null;
  /** Phase of the fundamental against the injected sine, degrees, on the closed form's branch. */
  phaseDeg: number | null;
  /**
   * RMS of what the fundamental and the drift do not explain, over the fundamental's RMS: 0 for a
   * linear joint (integration error only), larger where a limit or friction bends the waveform.
   */
  distortion: number | null;
  /** The torque limit acted during the measured periods. */
  saturated: boolean;
  /** Static friction held the joint at some time in the measured periods. */
  stuck: boolean;
  /** Why there is no figure, when there is none. */
  reason: string | null;
}

export interface SineSweepRequest {
  frequencies: readonly number[];
  /** Path measured: angle from the reference (closed loop only) or from an external torque. */
  channel: InputChannel;
  /** Amplitude of the injected sine, rad (reference) or N·m (torque). */
  amplitude: number;
}

export interface SineSweepResult {
  channel: InputChannel;
  amplitude: number;
  points: MeasuredPoint[];
}

/**
 * The slowest decay rate of the linear loop's transient, 1/s, and how many poles sit at the
 * origin; or why no steady sinusoid exists (a pole in the right half-plane or on the axis).
 */
function transientOf(scenario: Scenario): { ok: true; rate: number; drifts: boolean } | { ok: false; reason: string } {
  const roots = polynomialRoots(loopChannelsOf(scenario).characteristic);
  if (!roots.ok) return { ok: false, reason: `the loop's poles could not be found: ${roots.reason}` };
  let rate = Infinity;
  let origin = 0;
  for (const p of roots.roots) {
    if (p.re === 0 && p.im === 0) {
      origin++;
      continue;
    }
    const where = poleLocation(p);
    if (where === 'right') return { ok: false, reason: 'the loop is unstable: there is no steady response to measure' };
    if (where === 'axis') return { ok: false, reason: 'an undamped pole on the imaginary axis: the response never settles' };
    rate = Math.min(rate, -p.re);
  }
  // Up to two poles at the origin leave an offset and a constant drift, which the fit removes.
  if (origin > 2) return { ok: false, reason: 'more than two poles at the origin: the response drifts faster than the fit can remove' };
  return { ok: true, rate, drifts: origin > 0 };
}

/**
 * Least squares of y ≈ c0 + a·sin ωt + b·cos ωt (+ c1·t when the joint drifts), by mathjs lusolve
 * on the normal equations. Without the drift term, whole periods sampled evenly make the fit the
 * discrete Fourier coefficient of the fundamental, blind to every harmonic a limit adds; the
 * drift term is not orthogonal to the harmonics, so it is used only where a pole at the origin
 * needs it.
 */
function fitFundamental(t: Float64Array, y: Float64Array, w: number, drifts: boolean): { a: number; b: number; residualRms: number } {
  const n = t.length;
  const t0 = t[0]!;
  const span = t[n - 1]! - t0 || 1;
  // The trend on a unit interval keeps the normal equations well conditioned.
  const basis = (i: number): number[] => {
    const tt = t[i]!;
    return drifts ? [Math.sin(w * tt), Math.cos(w * tt), 1, (tt - t0) / span] : [Math.sin(w * tt), Math.cos(w * tt), 1];
  };
  const m = drifts ? 4 : 3;
  const A = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  const rhs = new Array<number>(m).fill(0);
  for (let i = 0; i < n; i++) {
    const f = basis(i);
    for (let r = 0; r < m; r++) {
      rhs[r]! += f[r]! * y[i]!;
      for (let c = 0; c < m; c++) A[r]![c]! += f[r]! * f[c]!;
    }
  }
  const c = (lusolve(A, rhs) as number[][]).map((row) => row[0]!);
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const f = basis(i);
    let e = y[i]!;
    for (let r = 0; r < m; r++) e -= c[r]! * f[r]!;
    sum += e * e;
  }
  return { a: c[0]!, b: c[1]!, residualRms: Math.sqrt(sum / n) };
}

const DEG = 180 / Math.PI;
const CHUNK_SAMPLES = 4096;

function unmeasured(frequency: number, reason: string): MeasuredPoint {
  return { frequency, magnitudeDb: null, phaseDeg: null, distortion: null, saturated: false, stuck: false, reason };
}

/**
 * The twin's measured frequency response: for each frequency, the scenario from rest with one
 * sine of the given amplitude on the channel (its own inputs removed, its nonlinear block kept),
 * run past its transient, and the fundamental of the angle fitted over whole periods. With every
 * effect off it is the closed form's response; with a torque limit or friction it shows how they
 * change it at that amplitude. Batch work: each frequency is a full twin run.
 */
export function sineSweepOfTwin(scenario: Scenario, request: SineSweepRequest): Parsed<SineSweepResult> {
  const { frequencies, channel, amplitude } = request;
  const errors = [];
  if (frequencies.length === 0 || frequencies.length > SINE_SWEEP_DEFAULTS.maxFrequencies) errors.push({ field: 'frequencies', message: `1 to ${SINE_SWEEP_DEFAULTS.maxFrequencies} frequencies` });
  if (!frequencies.every((w) => Number.isFinite(w) && w > 0)) errors.push({ field: 'frequencies', message: 'each frequency must be a positive number of rad/s' });
  if (!(Number.isFinite(amplitude) && amplitude > 0)) errors.push({ field: 'amplitude', message: 'must be a positive number' });
  if (channel === 'reference' && scenario.controller.mode !== 'pid') errors.push({ field: 'channel', message: 'an open loop has no reference: measure the torque channel' });
  if (errors.length > 0) return { ok: false, errors };
  const transient = transientOf(scenario);
  if (!transient.ok) return { ok: false, errors: [{ field: '', message: transient.reason }] };

  // The closed form's phase at each frequency picks the branch of the measured phase.
  const reference = branchReference(scenario, channel, frequencies);

  const points = frequencies.map((w, i) => measureOne(scenario, channel, amplitude, w, transient, reference[i]!));
  return { ok: true, value: { channel, amplitude, points } };
}

/** The closed form's unwrapped phase of the channel at each frequency (0 where it has none). */
function branchReference(scenario: Scenario, channel: InputChannel, frequencies: readonly number[]): number[] {
  return frequencies.map((w) => {
    const r = frequencyResponseOf(scenario, { from: w, to: w * (1 + 1e-9), points: 2 });
    if (!r.ok) return 0;
    const series = channel === 'reference' ? r.value.referenceToAngle : r.value.torqueToAngle;
    return series?.phaseDeg[0] ?? 0;
  });
}

function measureOne(scenario: Scenario, channel: InputChannel, amplitude: number, w: number, { rate, drifts }: { rate: number; drifts: boolean }, branch: number): MeasuredPoint {
  const d = SINE_SWEEP_DEFAULTS;
  const period = (2 * Math.PI) / w;
  const settle = Math.max(d.minSettlePeriods * period, Number.isFinite(rate) ? Math.log(1 / d.transientFraction) / rate : 0);
  const settlePeriods = Math.ceil(settle / period);
  const horizon = (settlePeriods + d.measuredPeriods) * period;
  if (horizon > MAX_HORIZON_S) return unmeasured(w, `the transient needs ${settle.toPrecision(3)} s to die out, past the ${MAX_HORIZON_S} s a run may last`);
  const dt = period / d.samplesPerPeriod;
  const run = createTwinRun(
    { ...scenario, initial: { angle: 0, velocity: 0 }, inputs: [{ channel, shape: 'sine', amplitude, frequency: w, delay: 0 }], horizon },
    { dt },
  );
  const start = settlePeriods * d.samplesPerPeriod;
  const n = d.measuredPeriods * d.samplesPerPeriod;
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  let saturated = false;
  let stuck = false;
  let index = 0;
  while (!run.done && index < start + n) {
    const chunk = run.advance(Math.min(horizon, run.time + CHUNK_SAMPLES * dt));
    for (let i = 0; i < chunk.t.length; i++, index++) {
      const k = index - start;
      if (k < 0 || k >= n) continue;
      t[k] = chunk.t[i]!;
      y[k] = chunk.angle[i]!;
      saturated ||= chunk.saturating[i] === 1;
      stuck ||= chunk.sticking[i] === 1;
    }
  }
  if (run.stop) return unmeasured(w, `the twin stopped: ${run.stop.message}`);
  if (index < start + n) return unmeasured(w, 'the twin run ended before the measured periods');
  const fit = fitFundamental(t, y, w, drifts);
  const fundamental = Math.hypot(fit.a, fit.b);
  if (!(fundamental > 0) || !Number.isFinite(fundamental)) return unmeasured(w, 'the angle does not move at this frequency');
  const phase = Math.atan2(fit.b, fit.a) * DEG;
  return {
    frequency: w,
    magnitudeDb: 20 * Math.log10(fundamental / amplitude),
    phaseDeg: phase + 360 * Math.round((branch - phase) / 360),
    distortion: fit.residualRms / (fundamental / Math.SQRT2),
    saturated,
    stuck,
    reason: null,
  };
}
