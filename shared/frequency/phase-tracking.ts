import { zeroRootCount } from '../closed-form/polynomial';
import { type RationalFunction } from '../closed-form/rational-function';
import { cornerFrequencies, type FrequencyChannel } from './frequency-channel';

/**
 * Largest phase change accepted between two evaluated frequencies, degrees. Beyond it the step
 * is halved (on a log axis): atan2 alone cannot tell a turn of +190° from one of −170°.
 */
export const MAX_PHASE_STEP_DEG = 30;
/** Halvings allowed per step; a jump that survives them is a pole or zero on the axis itself. */
const MAX_HALVINGS = 40;
/**
 * Fewest log-spaced steps per decade the tracking takes, whatever grid it is asked for: within
 * one such step (4.7 % in frequency) the phase of a rational function turns by a full circle only
 * past two nearly undamped resonances inside that step.
 */
const MIN_STEPS_PER_DECADE = 50;

const DEG = 180 / Math.PI;

/**
 * Phase of the rational function as ω → 0+, degrees: each zero at the origin adds 90°, each pole
 * takes 90° away, and a negative ratio of the lowest coefficients adds a half turn (shown as a lag).
 * @example lowFrequencyPhaseDeg({ num: [1], den: [0, 1] }) // −90 (an integrator)
 */
export function lowFrequencyPhaseDeg(r: RationalFunction): number {
  const zn = zeroRootCount(r.num);
  const zd = zeroRootCount(r.den);
  const ratio = r.num[zn]! / r.den[zd]!;
  return 90 * (zn - zd) - (ratio < 0 ? 180 : 0);
}

/** arg H(jω) in degrees on the branch nearest `near`; `near` itself where H is not finite or zero. */
export function phaseNear(channel: FrequencyChannel, w: number, near: number): number {
  const h = channel.at(w);
  if (!Number.isFinite(h.re) || !Number.isFinite(h.im) || (h.re === 0 && h.im === 0)) return near;
  const a = Math.atan2(h.im, h.re) * DEG;
  return a + 360 * Math.round((near - a) / 360);
}

/**
 * The continuous phase at `wb` given the phase `pa` at `wa`, halving the step until no step
 * turns more than MAX_PHASE_STEP_DEG.
 */
export function continuePhase(channel: FrequencyChannel, wa: number, pa: number, wb: number, depth = 0): number {
  const pb = phaseNear(channel, wb, pa);
  if (Math.abs(pb - pa) <= MAX_PHASE_STEP_DEG || depth >= MAX_HALVINGS) return pb;
  const wm = Math.sqrt(wa * wb);
  const pm = continuePhase(channel, wa, pa, wm, depth + 1);
  return continuePhase(channel, wm, pm, wb, depth + 1);
}

/**
 * A frequency far enough below every corner and every inner delay's 1/τ that the phase there is
 * the low-frequency asymptote to within a tenth of a degree.
 */
export function asymptoticFrequency(channel: FrequencyChannel, below: number): number {
  let w = below;
  for (const c of cornerFrequencies(channel.rational)) w = Math.min(w, 1e-3 * c);
  if (channel.innerDelay > 0) w = Math.min(w, 1e-3 / channel.innerDelay);
  return w;
}

/**
 * An inner delay turns H0's phase by up to ω·τ per unit of ω where |L| is large: steps stay
 * under a twelfth of a turn of it up to this many radians of ωτ. Past it the loop gain of any
 * joint has long rolled off, and the bound keeps the step count finite for any grid.
 */
const INNER_DELAY_TRACKED_RAD = 1000;

function nextStep(channel: FrequencyChannel, w: number, ratio: number): number {
  const tau = channel.innerDelay;
  if (tau === 0 || w * tau > INNER_DELAY_TRACKED_RAD) return w * ratio;
  return Math.min(w * ratio, w + Math.PI / 6 / tau);
}

/**
 * The unwrapped phase of the channel at increasing frequencies, degrees: H0's phase started on
 * the branch of the low-frequency asymptote and followed continuously (so a lag of 270° reads
 * −270°, not +90°), minus the pure delay's ωτ, exactly. A pole or zero exactly on the imaginary
 * axis makes a jump of 180°, taken on the nearer branch.
 */
export function trackPhase(channel: FrequencyChannel, frequencies: readonly number[]): number[] {
  if (frequencies.length === 0) return [];
  let w = asymptoticFrequency(channel, frequencies[0]!);
  let p = phaseNear(channel, w, lowFrequencyPhaseDeg(channel.rational));
  const ratio = 10 ** (1 / MIN_STEPS_PER_DECADE);
  const out: number[] = [];
  for (const f of frequencies) {
    for (let next = nextStep(channel, w, ratio); next < f; next = nextStep(channel, w, ratio)) {
      p = continuePhase(channel, w, p, next);
      w = next;
    }
    if (f !== w) p = continuePhase(channel, w, p, f);
    w = f;
    out.push(p - f * channel.delay * DEG);
  }
  return out;
}
