import { gaussianSource, mulberry32 } from '../../twin/seeded-noise';
import type { RecordedSamples, TwinScenario } from '../../twin/recorded-samples';
import { simulateTwin } from '../../twin/twin-run';
import type { MeasuredTrace } from '../fit-request';

/**
 * Logs made by the twin itself from known parameters, with seeded Gaussian noise on what is
 * "measured" (common practice for checking an estimator: the truth is known, the noise is
 * reproducible). For the recovery specs and the fit bench.
 */

/**
 * A logged command at `rate` Hz for `seconds`: a random staircase (a new level every `hold`
 * seconds, uniform in ±amplitude) — a rich excitation, as identification experiments use.
 */
export function staircaseSignal(seconds: number, rate: number, hold: number, amplitude: number, seed: number): RecordedSamples {
  const n = Math.round(seconds * rate) + 1;
  const uniform = mulberry32(seed);
  const t = new Float64Array(n);
  const values = new Float64Array(n);
  const perLevel = Math.max(1, Math.round(hold * rate));
  let level = 0;
  for (let i = 0; i < n; i++) {
    t[i] = i / rate;
    if (i % perLevel === 0) level = amplitude * (2 * uniform() - 1);
    values[i] = level;
  }
  return { t, values };
}

/** A logged command at `rate` Hz: a sum of sines (a multisine), different at every sample. */
export function multisineSignal(seconds: number, rate: number, amplitude: number, frequencies: readonly number[]): RecordedSamples {
  const n = Math.round(seconds * rate) + 1;
  const t = new Float64Array(n);
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = i / rate;
    let v = 0;
    frequencies.forEach((w, k) => (v += Math.sin(w * t[i]! + k)));
    values[i] = (amplitude * v) / frequencies.length;
  }
  return { t, values };
}

/**
 * The twin's trace of `scenario` at `rate` Hz, with noise of standard deviation `angleNoise`
 * (rad) and `velocityNoise` (rad/s, velocity left out when null) from `seed`.
 */
export function synthesizeTrace(scenario: TwinScenario, rate: number, angleNoise: number, velocityNoise: number | null, seed: number): MeasuredTrace {
  const run = simulateTwin(scenario, { dt: 1 / rate });
  if (run.stop) throw new Error(`the twin stopped synthesizing the log: ${run.stop.message}`);
  const noise = gaussianSource(seed);
  const { t, angle, velocity } = run.samples;
  const measuredAngle = angle.map((a) => a + angleNoise * noise.next());
  const measuredVelocity = velocityNoise === null ? undefined : velocity.map((v) => v + velocityNoise * noise.next());
  return { t: t.slice(), angle: measuredAngle, ...(measuredVelocity ? { velocity: measuredVelocity } : {}) };
}
