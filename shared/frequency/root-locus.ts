import { type Complex } from '../closed-form/complex-number';
import { addPolynomials, multiplyPolynomials, scalePolynomial, trimPolynomial } from '../closed-form/polynomial';
import { polynomialRoots } from '../closed-form/polynomial-roots';
import { type Scenario } from '../scenario/scenario-schema';
import { type Parsed } from '../validation/field-errors';

/** The loop gains a locus may vary. */
export const LOCUS_GAINS = ['kp', 'ki', 'kd'] as const;
export type LocusGain = (typeof LOCUS_GAINS)[number];
/** Most gain values in one locus. */
export const MAX_LOCUS_POINTS = 2000;

export interface RootLocusRequest {
  gain: LocusGain;
  /** Lowest and highest value of the gain, in its own unit; `to` > `from` ≥ 0. */
  from: number;
  to: number;
  points: number;
  spacing: 'linear' | 'log';
}

export interface RootLocus {
  gain: LocusGain;
  values: number[];
  /** poles[i] are the closed-loop poles at values[i]; pole j of one value continues pole j of the one before. */
  poles: Complex[][];
  /** The scenario's own gain and its poles, to mark on the locus. */
  current: { value: number; poles: Complex[] };
}

/**
 * P(s) = s·Ds·G + N(kp·s·Ds + ki·Ds + kd·s²) split as P0 + g·Pg for the varied gain g (the
 * characteristic polynomial of the joint loop, as jointTransfer builds it, before an s common
 * to every channel is removed). With ki = 0 and the locus not over ki, that exact factor s is
 * divided out, as the closed form does, so no spurious pole sits at the origin.
 */
function affineCharacteristic(scenario: Scenario, gain: LocusGain): { base: number[]; slope: number[]; stripS: boolean } {
  const { inertia: J, damping: b, stiffness: k, gearRatio: N } = scenario.joint;
  const c = scenario.controller;
  const G = trimPolynomial([k, b, J]);
  // The filter stays in the loop whenever kd acts (including along a kd locus).
  const filtered = c.derivativeFilter > 0 && (c.kd > 0 || gain === 'kd');
  const Ds = filtered ? [1, c.derivativeFilter] : [1];
  const sDs = multiplyPolynomials([0, 1], Ds);
  const term: Record<LocusGain, number[]> = { kp: scalePolynomial(sDs, N), ki: scalePolynomial(Ds, N), kd: [0, 0, N] };
  let base = multiplyPolynomials(sDs, G);
  for (const g of LOCUS_GAINS) if (g !== gain) base = addPolynomials(base, scalePolynomial(term[g], c[g]));
  return { base, slope: term[gain], stripS: gain !== 'ki' && c.ki === 0 };
}

const distance = (a: Complex, b: Complex) => Math.hypot(a.re - b.re, a.im - b.im);

/** Every ordering of 0 … n−1 (n ≤ 6 here: the loop's degree is at most 4). */
function permutations(n: number): number[][] {
  if (n === 0) return [[]];
  return permutations(n - 1).flatMap((p) => Array.from({ length: n }, (_, i) => [...p.slice(0, i), n - 1, ...p.slice(i)]));
}

/**
 * Orders `next` so that pole j continues pole j of `previous`: the assignment with the least
 * total movement, tried exhaustively (a handful of poles), so no branch jumps to another's place.
 */
function matchBranches(previous: Complex[], next: Complex[]): Complex[] {
  if (previous.length !== next.length || next.length > 6) return next;
  let best: number[] = [];
  let bestCost = Infinity;
  for (const order of permutations(next.length)) {
    let cost = 0;
    for (let j = 0; j < order.length && cost < bestCost; j++) cost += distance(previous[j]!, next[order[j]!]!);
    if (cost < bestCost) [best, bestCost] = [order, cost];
  }
  return best.map((i) => next[i]!);
}

/**
 * The closed-loop poles of the joint loop as one gain runs over a range, the others held at the
 * scenario's values (a root locus, Evans 1948; common practice). Closed loop only.
 * @example rootLocus(scenario, { gain: 'kp', from: 0, to: 100, points: 200, spacing: 'linear' })
 */
export function rootLocus(scenario: Scenario, request: RootLocusRequest): Parsed<RootLocus> {
  const { gain, from, to, points, spacing } = request;
  const errors = [];
  if (scenario.controller.mode !== 'pid') errors.push({ field: 'controller.mode', message: 'a root locus needs the PID loop; an open loop has no gain to vary' });
  if (!(LOCUS_GAINS as readonly string[]).includes(gain)) errors.push({ field: 'gain', message: 'must be kp, ki or kd' });
  if (!(Number.isFinite(from) && from >= 0)) errors.push({ field: 'from', message: 'must be zero or a positive number' });
  if (!(Number.isFinite(to) && to > from)) errors.push({ field: 'to', message: 'must be a number above from' });
  if (spacing === 'log' && !(from > 0)) errors.push({ field: 'from', message: 'must be above zero for log spacing' });
  if (!Number.isInteger(points) || points < 2 || points > MAX_LOCUS_POINTS) errors.push({ field: 'points', message: `must be a whole number from 2 to ${MAX_LOCUS_POINTS}` });
  if (errors.length > 0) return { ok: false, errors };
  const { base, slope, stripS } = affineCharacteristic(scenario, gain);
  const polesAt = (g: number): Parsed<Complex[]> => {
    let p = addPolynomials(base, scalePolynomial(slope, g));
    if (stripS) p = trimPolynomial(p.slice(1));
    const r = polynomialRoots(p);
    return r.ok ? { ok: true, value: r.roots } : { ok: false, errors: [{ field: gain, message: `the poles at ${gain} = ${g} could not be found: ${r.reason}` }] };
  };
  const values = Array.from({ length: points }, (_, i) => {
    if (i === points - 1) return to;
    if (i === 0) return from;
    return spacing === 'log' ? from * (to / from) ** (i / (points - 1)) : from + ((to - from) * i) / (points - 1);
  });
  const poles: Complex[][] = [];
  for (const v of values) {
    const r = polesAt(v);
    if (!r.ok) return r;
    poles.push(poles.length === 0 ? r.value : matchBranches(poles.at(-1)!, r.value));
  }
  const current = polesAt(scenario.controller[gain]);
  if (!current.ok) return current;
  return { ok: true, value: { gain, values, poles, current: { value: scenario.controller[gain], poles: current.value } } };
}
