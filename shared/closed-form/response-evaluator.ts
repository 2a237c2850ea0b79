import { type InvertedPiece } from './inverse-response';

/** Grid points between exact re-anchors of e^(pτ); the recurrence's roundoff grows ~k·ε in between. */
export const EVALUATOR_ANCHOR_INTERVAL = 256;

/**
 * The closed form compiled for evaluation: the time axis is cut at every distinct delay, and in
 * each segment [b_k, b_k+1) all active terms sharing a pole are merged into one polynomial in
 * τ = t − b_k times e^(pτ). Coefficients of a conjugate pair carry the factor 2 (value = Re).
 * Plain typed arrays, built once per solution.
 */
export interface ResponsePlan {
  /** Segment origins b_k, s, ascending. */
  segmentStart: Float64Array;
  /** Groups of segment k are segmentGroup[k] … segmentGroup[k+1]−1. */
  segmentGroup: Int32Array;
  groupRe: Float64Array;
  groupIm: Float64Array;
  /** Coefficients of group g are groupCoef[g] … groupCoef[g+1]−1, lowest power first. */
  groupCoef: Int32Array;
  angleRe: Float64Array;
  angleIm: Float64Array;
  velocityRe: Float64Array;
  velocityIm: Float64Array;
}

interface GroupDraft {
  re: number;
  im: number;
  angle: { re: number; im: number }[];
  velocity: { re: number; im: number }[];
}

/**
 * Compiles inverted pieces into a ResponsePlan (impulse terms are not point values and are left out).
 * @example evaluateUniformGrid(compileResponsePlan(pieces), 0.001, 10001, angle, velocity)
 */
export function compileResponsePlan(pieces: readonly InvertedPiece[]): ResponsePlan {
  const active = pieces.filter((p) => p.modes.length > 0);
  const starts = [...new Set(active.map((p) => p.delay))].sort((a, b) => a - b);
  const segmentGroup: number[] = [0];
  const groups: GroupDraft[] = [];
  for (const b of starts) {
    const byPole = new Map<string, GroupDraft>();
    for (const piece of active) {
      if (piece.delay > b) continue;
      const d = b - piece.delay;
      for (const mode of piece.modes) {
        const key = `${mode.pole.re}:${mode.pole.im}`;
        let g = byPole.get(key);
        if (!g) {
          g = { re: mode.pole.re, im: mode.pole.im, angle: [], velocity: [] };
          byPole.set(key, g);
        }
        const pairFactor = mode.pole.im > 0 ? 2 : 1;
        addShifted(g.angle, mode.angle, mode.pole, d, pairFactor);
        addShifted(g.velocity, mode.velocity, mode.pole, d, pairFactor);
      }
    }
    for (const g of byPole.values()) {
      if (g.angle.every((c) => c.re === 0 && c.im === 0) && g.velocity.every((c) => c.re === 0 && c.im === 0)) continue;
      groups.push(g);
    }
    segmentGroup.push(groups.length);
  }
  const groupCoef = [0];
  for (const g of groups) groupCoef.push(groupCoef[groupCoef.length - 1]! + g.angle.length);
  const total = groupCoef[groupCoef.length - 1]!;
  const plan: ResponsePlan = {
    segmentStart: Float64Array.from(starts),
    segmentGroup: Int32Array.from(segmentGroup),
    groupRe: Float64Array.from(groups.map((g) => g.re)),
    groupIm: Float64Array.from(groups.map((g) => g.im)),
    groupCoef: Int32Array.from(groupCoef),
    angleRe: new Float64Array(total),
    angleIm: new Float64Array(total),
    velocityRe: new Float64Array(total),
    velocityIm: new Float64Array(total),
  };
  groups.forEach((g, gi) => {
    const o = groupCoef[gi]!;
    g.angle.forEach((c, j) => {
      plan.angleRe[o + j] = c.re;
      plan.angleIm[o + j] = c.im;
      plan.velocityRe[o + j] = g.velocity[j]!.re;
      plan.velocityIm[o + j] = g.velocity[j]!.im;
    });
  });
  return plan;
}

/** acc(τ) += factor·Σ_j c_j (τ + d)^j e^(p(τ + d)), expanded in powers of τ. */
function addShifted(acc: { re: number; im: number }[], c: readonly { re: number; im: number }[], p: { re: number; im: number }, d: number, factor: number): void {
  const m = Math.exp(p.re * d) * factor;
  const er = p.im === 0 ? m : m * Math.cos(p.im * d);
  const ei = p.im === 0 ? 0 : m * Math.sin(p.im * d);
  while (acc.length < c.length) acc.push({ re: 0, im: 0 });
  for (let i = 0; i < c.length; i++) {
    let sr = 0;
    let si = 0;
    let binom = 1;
    let dp = 1;
    for (let j = i; j < c.length; j++) {
      sr += c[j]!.re * binom * dp;
      si += c[j]!.im * binom * dp;
      binom = (binom * (j + 1)) / (j + 1 - i);
      dp *= d;
    }
    acc[i]!.re += sr * er - si * ei;
    acc[i]!.im += sr * ei + si * er;
  }
}

/** First grid index i with i·dt ≥ b, computed on the same i·dt the grid uses. */
function firstIndexAtOrAfter(b: number, dt: number): number {
  let i = Math.max(0, Math.ceil(b / dt));
  while (i > 0 && (i - 1) * dt >= b) i--;
  while (i * dt < b) i++;
  return i;
}

/**
 * Angle (rad) and velocity (rad/s) on the grid t_i = i·dt, i = 0 … count−1, written into the
 * given arrays (length ≥ count). Allocates nothing: e^(pτ) advances by one complex multiply per
 * point and is re-anchored exactly every EVALUATOR_ANCHOR_INTERVAL points. Values at a term's
 * start time are right limits (t = a counts as after the step).
 * @param dt grid spacing, s
 * @example evaluateUniformGrid(plan, 0.001, 10001, new Float64Array(10001), new Float64Array(10001))
 */
export function evaluateUniformGrid(plan: ResponsePlan, dt: number, count: number, angle: Float64Array, velocity: Float64Array): void {
  angle.fill(0, 0, count);
  velocity.fill(0, 0, count);
  const segments = plan.segmentStart.length;
  for (let k = 0; k < segments; k++) {
    const b = plan.segmentStart[k]!;
    const i0 = Math.min(firstIndexAtOrAfter(b, dt), count);
    const i1 = k + 1 < segments ? Math.min(firstIndexAtOrAfter(plan.segmentStart[k + 1]!, dt), count) : count;
    if (i1 <= i0) continue;
    for (let g = plan.segmentGroup[k]!; g < plan.segmentGroup[k + 1]!; g++) {
      if (plan.groupIm[g] === 0) addRealGroup(plan, g, b, dt, i0, i1, angle, velocity);
      else addPairGroup(plan, g, b, dt, i0, i1, angle, velocity);
    }
  }
}

function addRealGroup(plan: ResponsePlan, g: number, b: number, dt: number, i0: number, i1: number, angle: Float64Array, velocity: Float64Array): void {
  const p = plan.groupRe[g]!;
  const c0 = plan.groupCoef[g]!;
  const last = plan.groupCoef[g + 1]! - 1;
  const w = Math.exp(p * dt);
  const ar = plan.angleRe;
  const vr = plan.velocityRe;
  let z = 0;
  for (let i = i0; i < i1; i++) {
    const tau = i * dt - b;
    if ((i - i0) % EVALUATOR_ANCHOR_INTERVAL === 0) z = Math.exp(p * tau);
    let a = ar[last]!;
    let v = vr[last]!;
    for (let j = last - 1; j >= c0; j--) {
      a = a * tau + ar[j]!;
      v = v * tau + vr[j]!;
    }
    angle[i]! += a * z;
    velocity[i]! += v * z;
    z *= w;
    // Flush to zero before subnormals: they are harmless to the sum but slow the loop a hundredfold.
    if (z < 1e-290 && z > -1e-290) z = 0;
  }
}

function addPairGroup(plan: ResponsePlan, g: number, b: number, dt: number, i0: number, i1: number, angle: Float64Array, velocity: Float64Array): void {
  const pr = plan.groupRe[g]!;
  const pi = plan.groupIm[g]!;
  const c0 = plan.groupCoef[g]!;
  const last = plan.groupCoef[g + 1]! - 1;
  const wm = Math.exp(pr * dt);
  const wr = wm * Math.cos(pi * dt);
  const wi = wm * Math.sin(pi * dt);
  const aR = plan.angleRe;
  const aI = plan.angleIm;
  const vR = plan.velocityRe;
  const vI = plan.velocityIm;
  let zr = 0;
  let zi = 0;
  for (let i = i0; i < i1; i++) {
    const tau = i * dt - b;
    if ((i - i0) % EVALUATOR_ANCHOR_INTERVAL === 0) {
      const m = Math.exp(pr * tau);
      zr = m * Math.cos(pi * tau);
      zi = m * Math.sin(pi * tau);
    }
    let ar = aR[last]!;
    let ai = aI[last]!;
    let vr = vR[last]!;
    let vi = vI[last]!;
    for (let j = last - 1; j >= c0; j--) {
      ar = ar * tau + aR[j]!;
      ai = ai * tau + aI[j]!;
      vr = vr * tau + vR[j]!;
      vi = vi * tau + vI[j]!;
    }
    angle[i]! += ar * zr - ai * zi;
    velocity[i]! += vr * zr - vi * zi;
    const nr = zr * wr - zi * wi;
    zi = zr * wi + zi * wr;
    zr = nr;
    // Flush to zero before subnormals (see addRealGroup).
    if (zr < 1e-290 && zr > -1e-290 && zi < 1e-290 && zi > -1e-290) {
      zr = 0;
      zi = 0;
    }
  }
}

/**
 * Angle (rad, which = 0) or velocity (rad/s, which = 1) at one time, exactly (no recurrence).
 * Right limit at a term's start. Allocates nothing.
 * @example responseAt(plan, 0.25, 0) // θ(0.25)
 */
export function responseAt(plan: ResponsePlan, t: number, which: 0 | 1): number {
  const starts = plan.segmentStart;
  let k = -1;
  for (let s = 0; s < starts.length; s++) if (starts[s]! <= t) k = s;
  if (k < 0) return 0;
  const tau = t - starts[k]!;
  const cr = which === 0 ? plan.angleRe : plan.velocityRe;
  const ci = which === 0 ? plan.angleIm : plan.velocityIm;
  let sum = 0;
  for (let g = plan.segmentGroup[k]!; g < plan.segmentGroup[k + 1]!; g++) {
    const c0 = plan.groupCoef[g]!;
    const last = plan.groupCoef[g + 1]! - 1;
    let ar = cr[last]!;
    let ai = ci[last]!;
    for (let j = last - 1; j >= c0; j--) {
      ar = ar * tau + cr[j]!;
      ai = ai * tau + ci[j]!;
    }
    const m = Math.exp(plan.groupRe[g]! * tau);
    const im = plan.groupIm[g]!;
    sum += im === 0 ? ar * m : m * (ar * Math.cos(im * tau) - ai * Math.sin(im * tau));
  }
  return sum;
}
