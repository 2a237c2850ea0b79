import type { InputTerm, Scenario } from '../scenario/scenario-schema';
import { simulateTwin, type EffectOnset, type TwinOptions, type TwinStop } from '../twin/twin-run';
import { CHECK_DEFAULTS, checkDt, delayTerms, formatRatio, scaleTerms, zeroStateWith, type CheckVerdict } from './check-verdict';

/** Defaults of the superposition check; the README quotes these. */
export const SUPERPOSITION_DEFAULTS = {
  /** Scale of the homogeneity run α·u1. */
  alpha: 2,
  /** Default u2: the scenario's own inputs started this fraction of the horizon later. */
  secondInputDelayFraction: 1 / 3,
} as const;

/** What to superpose and how strictly; every field has a default. */
export interface SuperpositionOptions {
  /** First input, default the scenario's inputs. */
  u1?: InputTerm[];
  /** Second input, default u1 started horizon/3 later. */
  u2?: InputTerm[];
  /** Scale of the homogeneity run; default 2. */
  alpha?: number;
  /** Largest passing deviation relative to the peak; default CHECK_DEFAULTS.threshold. */
  threshold?: number;
  /** Twin settings of every run; dt defaults to checkDt(horizon). */
  twin?: TwinOptions;
  /**
   * The u1 run when the caller has it already: simulateTwin(zeroStateWith(scenario, u1), twin)
   * with these very options (the gain map's step run is that run). Saves one of the four runs.
   */
  u1Run?: TwinRunResult;
}

/** What simulateTwin returns. */
export type TwinRunResult = ReturnType<typeof simulateTwin>;

/** A nonlinear effect seen in one of the check's runs. */
export interface RunEffect extends EffectOnset {
  /** Which run, e.g. "u1+u2". */
  run: string;
}

/** The verdict plus its two parts and the effects met. */
export interface SuperpositionResult extends CheckVerdict {
  /** max |y(u1+u2) − y1 − y2| / peak */
  additivity: number;
  /** max |y(α·u1) − α·y1| / peak */
  homogeneity: number;
  /** Largest |angle| over the four runs, rad. */
  peak: number;
  /** First time the deviation exceeded the threshold, s (null when it never did). */
  firstExceeded: number | null;
  /** Every nonlinear effect the runs met, earliest first. */
  effects: RunEffect[];
}

/**
 * Superposition check: zero-state twin runs for u1, u2, u1+u2 and α·u1, and the worst deviation of
 * y(u1+u2) from y1 + y2 and of y(α·u1) from α·y1, relative to the peak. A linear system passes
 * (superposition principle, common practice); when it fails, the reason names the first nonlinear
 * effect that engaged and when.
 * @example superpositionCheck(scenario).pass // true for a scenario with every effect off
 */
export function superpositionCheck(scenario: Scenario, options: SuperpositionOptions = {}): SuperpositionResult {
  const alpha = options.alpha ?? SUPERPOSITION_DEFAULTS.alpha;
  const threshold = options.threshold ?? CHECK_DEFAULTS.threshold;
  const u1 = options.u1 ?? scenario.inputs;
  const u2 = options.u2 ?? delayTerms(u1, scenario.horizon * SUPERPOSITION_DEFAULTS.secondInputDelayFraction);
  const twin: TwinOptions = { ...options.twin, dt: checkDt(scenario.horizon, options.twin ?? {}) };

  const runs = [
    { name: 'u1', inputs: u1 },
    { name: 'u2', inputs: u2 },
    { name: 'u1+u2', inputs: [...u1, ...u2] },
    { name: `${alpha}·u1`, inputs: scaleTerms(u1, alpha) },
  ].map((run, i) => ({ ...run, ...(i === 0 && options.u1Run ? options.u1Run : simulateTwin(zeroStateWith(scenario, run.inputs), twin)) }));

  const effects: RunEffect[] = runs.flatMap((run) => run.effects.map((e) => ({ ...e, run: run.name }))).sort((a, b) => a.time - b.time);
  const stopped = runs.find((run) => run.stop !== null);
  if (stopped) return stoppedResult(stopped.name, stopped.stop!, threshold, effects);

  const [y1, y2, y12, ya] = runs.map((run) => run.samples.angle) as [Float64Array, Float64Array, Float64Array, Float64Array];
  const t = runs[0]!.samples.t;
  let peak = 0;
  for (const y of [y1, y2, y12, ya]) for (let i = 0; i < y.length; i++) peak = Math.max(peak, Math.abs(y[i]!));
  if (peak === 0) {
    // Nothing moved. With no effect engaged that is the linear answer to a zero input; with one
    // engaged (stiction holding, a dead band swallowing the torque) the linear model would have
    // moved, so the response is not proportional to the input.
    const cause = effects[0];
    if (cause) {
      return {
        pass: false,
        worst: Infinity,
        threshold,
        worstTime: cause.time,
        reason: `${cause.description} at t = ${cause.time.toFixed(3)} s in the ${cause.run} run: no run moved the joint although torque acted`,
        additivity: Infinity,
        homogeneity: Infinity,
        peak,
        firstExceeded: cause.time,
        effects,
      };
    }
    return {
      pass: true,
      worst: 0,
      threshold,
      worstTime: 0,
      reason: 'no run moved the joint (peak 0 rad) and no effect engaged: superposition holds trivially',
      additivity: 0,
      homogeneity: 0,
      peak,
      firstExceeded: null,
      effects,
    };
  }
  let additivity = 0;
  let homogeneity = 0;
  let worstTime = 0;
  let firstExceeded: number | null = null;
  for (let i = 0; i < t.length; i++) {
    const a = Math.abs(y12[i]! - y1[i]! - y2[i]!) / peak;
    const h = Math.abs(ya[i]! - alpha * y1[i]!) / peak;
    if (Math.max(a, h) > Math.max(additivity, homogeneity)) worstTime = t[i]!;
    additivity = Math.max(additivity, a);
    homogeneity = Math.max(homogeneity, h);
    if (firstExceeded === null && Math.max(a, h) > threshold) firstExceeded = t[i]!;
  }
  const worst = Math.max(additivity, homogeneity);
  const pass = worst <= threshold;
  const which = additivity >= homogeneity ? 'y(u1+u2) departs from y1 + y2' : `y(${alpha}·u1) departs from ${alpha}·y1`;
  const measured = `${which} by ${formatRatio(worst)} of the peak at t = ${worstTime.toFixed(3)} s (threshold ${formatRatio(threshold)})`;
  let reason: string;
  if (pass) reason = `superposition holds: worst deviation ${formatRatio(worst)} of the peak (threshold ${formatRatio(threshold)})`;
  else reason = `${explainBreak(effects, firstExceeded!)}; ${measured}`;
  return { pass, worst, threshold, worstTime, reason, additivity, homogeneity, peak, firstExceeded, effects };
}

/** Names the effect that broke linearity: the earliest one that engaged before the deviation showed. */
export function explainBreak(effects: readonly RunEffect[], firstExceeded: number): string {
  const before = effects.filter((e) => e.time <= firstExceeded);
  const cause = before[0] ?? effects[0];
  if (!cause) return 'no nonlinear effect engaged in any run, so the deviation is integration error: tighten the twin tolerances';
  const others = [...new Set(before.slice(1).map((e) => e.effect))].filter((e) => e !== cause.effect);
  const also = others.length > 0 ? ` (also: ${others.join(', ')})` : '';
  return `${cause.description} at t = ${cause.time.toFixed(3)} s in the ${cause.run} run${also}`;
}

function stoppedResult(run: string, stop: TwinStop, threshold: number, effects: RunEffect[]): SuperpositionResult {
  return {
    pass: false,
    worst: Infinity,
    threshold,
    worstTime: stop.time,
    reason: `the ${run} run stopped before its horizon: ${stop.message}`,
    additivity: Infinity,
    homogeneity: Infinity,
    peak: Infinity,
    firstExceeded: stop.time,
    effects,
  };
}
