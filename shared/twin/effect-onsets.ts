import { resolveNonlinear } from '../scenario/nonlinear-schema';
import type { Scenario } from '../scenario/scenario-schema';

/** Nonlinear effects whose first action a run records (for the superposition and shift checks). */
export const twinEffects = ['torqueLimit', 'deadBand', 'friction', 'stiction', 'gravity', 'quantization', 'noise'] as const;
/** One of the nonlinear effects a run records. */
export type TwinEffect = (typeof twinEffects)[number];

/** The first time one nonlinear effect changed the run. */
export interface EffectOnset {
  effect: TwinEffect;
  /** s, on the output grid (sample instants for quantization and noise). */
  time: number;
  /** What happened, e.g. "torque limit ±2 N·m reached". */
  description: string;
}

/** When each effect first acted, s; NaN while it has not. Keyed by name so a new effect cannot shift the others. */
export type OnsetTimes = Record<TwinEffect, number>;

/** Onset times of a run that has not started. */
export function noOnsets(): OnsetTimes {
  // A literal, not built from twinEffects: the run marks onsets at every sample, and an object
  // of fixed shape keeps those stores cheap; the type makes the literal name every effect.
  return { torqueLimit: NaN, deadBand: NaN, friction: NaN, stiction: NaN, gravity: NaN, quantization: NaN, noise: NaN };
}

/** The effects that have acted so far, described with the scenario's values, in time order. */
export function effectOnsets(onsets: OnsetTimes, scenario: Scenario): EffectOnset[] {
  const nl = resolveNonlinear(scenario.nonlinear);
  const describe: Record<TwinEffect, string> = {
    torqueLimit: `torque limit ±${nl.torqueLimit} N·m reached`,
    deadBand: `drive dead band ±${nl.deadBand} N·m engaged`,
    friction: `Coulomb friction ${nl.coulombFriction} N·m sliding`,
    stiction: `static friction (breakaway ${nl.staticFriction} N·m) holding the joint`,
    gravity: `gravity load m·g·l = ${+nl.gravityTorque.toPrecision(6)} N·m acting`,
    quantization: `encoder quantization (${nl.encoderCounts} counts/rev) changed the measurement`,
    noise: `measurement noise (σ = ${nl.noiseStdDev} rad) present`,
  };
  const list: EffectOnset[] = [];
  for (const effect of twinEffects) {
    if (!Number.isNaN(onsets[effect])) list.push({ effect, time: onsets[effect], description: describe[effect] });
  }
  return list.sort((a, b) => a.time - b.time);
}
