import { absComplex } from '../closed-form/complex-number';
import { resolveNonlinear } from '../scenario/nonlinear-schema';
import { plantCautions } from '../scenario/plant-cautions';
import { type Scenario } from '../scenario/scenario-schema';
import { type Parsed } from '../validation/field-errors';
import { type FrequencyChannel } from './frequency-channel';
import { logFrequencies, type FrequencyGridRequest } from './frequency-grid';
import { loopChannelsOf, SAMPLED_LOOP_MODEL } from './loop-channels';
import { trackPhase } from './phase-tracking';
import { marginsOf, type LoopStability, type StabilityMargins } from './stability-margins';

/** Magnitude and unwrapped phase of one transfer path on the frequency grid; null where it is 0 or unbounded. */
export interface BodeSeries {
  magnitudeDb: (number | null)[];
  phaseDeg: (number | null)[];
}

/** The closed form's frequency response of a scenario's joint loop. */
export interface FrequencyResponse {
  /** rad/s, log-spaced, both ends included. */
  frequency: number[];
  /** L(jω), the loop broken at the drive; null in open loop. */
  loop: BodeSeries | null;
  /** Θ/R, closed loop; null in open loop. */
  referenceToAngle: BodeSeries | null;
  /** Θ/T from an external torque at the joint (the plant itself in open loop). */
  torqueToAngle: BodeSeries;
  margins: StabilityMargins;
  stability: LoopStability;
  /** The verdicts in words, the stability first. */
  notes: string[];
  /** How a sampled controller's delays were modelled; null for a continuous loop or open loop. */
  delayModel: string | null;
}

/** The twin's effects that a transfer function cannot hold (the compute delay it can, and does). */
function nonlinearEffectsLeftOut(scenario: Scenario): string[] {
  const n = resolveNonlinear(scenario.nonlinear);
  const left: string[] = [];
  if (n.torqueLimit !== Infinity) left.push('the torque limit');
  if (n.deadBand > 0) left.push('the dead band');
  if (n.staticFriction > 0) left.push('friction');
  if (n.gravityTorque !== 0) left.push('gravity');
  if (n.encoderCounts > 0) left.push('encoder quantization');
  if (n.noiseStdDev > 0) left.push('measurement noise');
  return left;
}

function bodeOf(channel: FrequencyChannel, frequencies: number[]): BodeSeries {
  const phase = trackPhase(channel, frequencies);
  const magnitudeDb: (number | null)[] = [];
  const phaseDeg: (number | null)[] = [];
  frequencies.forEach((w, i) => {
    // |e^(−jωτ)| = 1: the magnitude is H0's.
    const m = absComplex(channel.at(w));
    const usable = m > 0 && Number.isFinite(m);
    magnitudeDb.push(usable ? 20 * Math.log10(m) : null);
    phaseDeg.push(usable ? phase[i]! : null);
  });
  return { magnitudeDb, phaseDeg };
}

/**
 * Bode data of the loop, the reference-to-angle and torque-to-angle paths, with margins,
 * bandwidth and the stability verdict, from the scenario's transfer functions (the linear model:
 * the nonlinear block is not in it). Field errors name a bad grid.
 * @example frequencyResponseOf(scenario, { from: 0.1, to: 1000, points: 200 })
 */
export function frequencyResponseOf(scenario: Scenario, grid: FrequencyGridRequest): Parsed<FrequencyResponse> {
  const frequencies = logFrequencies(grid);
  if (!frequencies.ok) return frequencies;
  const f = frequencies.value;
  const channels = loopChannelsOf(scenario);
  const report = marginsOf(channels.loop, channels.loopRational, channels.referenceToAngle, channels.characteristic, grid.from, grid.to);
  report.notes.push(...plantCautions(scenario));
  const left = nonlinearEffectsLeftOut(scenario);
  if (left.length > 0) report.notes.push(`the linear model's response: ${left.join(', ')} ${left.length > 1 ? 'are' : 'is'} not in it`);
  return {
    ok: true,
    value: {
      frequency: f,
      loop: channels.loop ? bodeOf(channels.loop, f) : null,
      referenceToAngle: channels.referenceToAngle ? bodeOf(channels.referenceToAngle, f) : null,
      torqueToAngle: bodeOf(channels.torqueToAngle, f),
      margins: report.margins,
      stability: report.stability,
      notes: report.notes,
      delayModel: channels.loopDelay > 0 ? SAMPLED_LOOP_MODEL : null,
    },
  };
}
