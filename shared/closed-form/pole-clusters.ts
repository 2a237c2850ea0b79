import { type Complex } from './complex-number';
import { valueAndSlope } from './polynomial-roots';

/** A pole of a rational function, with how many times it repeats. */
export interface PoleCluster {
  /** rad/s in the s-plane (re: decay rate, im: angular frequency). */
  center: Complex;
  multiplicity: number;
}

/**
 * Spread (relative to the pole's size) below which a cluster of m computed roots is treated as
 * one m-fold pole. Separate residues of m poles δ apart cancel to an error near ε/δ^(m−1); the
 * merged pole is off by about δ². The two balance at δ = ε^(1/(m+1)), which is also wider than
 * the ε^(1/m) scatter a root finder leaves around a true m-fold root.
 * @example repeatedPoleTolerance(2) // ≈ 6.1e-6
 */
export function repeatedPoleTolerance(multiplicity: number): number {
  return TOLERANCES[multiplicity] ?? Math.pow(Number.EPSILON, 1 / (multiplicity + 1));
}

const TOLERANCES = Array.from({ length: 17 }, (_, m) => Math.pow(Number.EPSILON, 1 / (m + 1)));

interface Member {
  z: Complex;
  exact: boolean;
}

/**
 * Groups poles into repeated poles. `computed` are roots found numerically (scattered by
 * roundoff); `exact` are known in closed form (an input's s = 0 or ±jω0) and win as the center
 * of any cluster they join. Returns clusters closed under conjugation, sorted slowest first.
 * @example clusterPoles([{ re: -1 + 1e-9, im: 0 }, { re: -1 - 1e-9, im: 0 }], []) // [{ center: −1, multiplicity: 2 }]
 */
export function clusterPoles(computed: readonly Complex[], exact: readonly Complex[] = []): PoleCluster[] {
  const members: Member[] = [...computed.map((z) => ({ z, exact: false })), ...exact.map((z) => ({ z, exact: true }))];
  // Poles far closer to the origin than the function's largest pole are compared on that
  // scale: at 1e-12 of it, e^(pt) cannot tell them from each other over any double-precision span.
  let largest = 0;
  for (const m of members) largest = Math.max(largest, magnitude(m.z));
  const floor = SCALE_FLOOR * largest;
  const groups = splitCluster(members, members.length, floor);
  const clusters = groups.map(centerOf);
  clusters.sort((a, b) => b.center.re - a.center.re || b.center.im - a.center.im);
  return clusters;
}

/** Fraction of the largest pole's size below which poles are compared on an absolute scale. */
export const SCALE_FLOOR = 1e-12;

// sqrt(x² + y²) rather than Math.hypot (several times slower in V8): pole magnitudes here are
// bounded far below 1e150 by the engine's pole-span guard, so the squares cannot overflow.
function magnitude(z: Complex): number {
  return Math.sqrt(z.re * z.re + z.im * z.im);
}

function distanceRatio(a: Complex, b: Complex, floor: number): number {
  const dr = a.re - b.re;
  const di = a.im - b.im;
  if (dr === 0 && di === 0) return 0;
  return Math.sqrt(dr * dr + di * di) / Math.max(magnitude(a), magnitude(b), floor);
}

function findRoot(parent: number[], i: number): number {
  let r = i;
  while (parent[r] !== r) r = parent[r]!;
  parent[i] = r;
  return r;
}

/** Single-linkage groups at `level`'s tolerance; any group wider than its own size allows is split tighter. */
function splitCluster(members: Member[], level: number, floor: number): Member[][] {
  if (members.length <= 1 || level < 1) return members.map((m) => [m]);
  const tol = repeatedPoleTolerance(level);
  const parent = members.map((_, i) => i);
  for (let i = 0; i < members.length; i++) {
    for (let j = i + 1; j < members.length; j++) {
      if (distanceRatio(members[i]!.z, members[j]!.z, floor) <= tol) parent[findRoot(parent, i)] = findRoot(parent, j);
    }
  }
  const byRoot = new Map<number, Member[]>();
  members.forEach((m, i) => {
    const r = findRoot(parent, i);
    const group = byRoot.get(r);
    if (group) group.push(m);
    else byRoot.set(r, [m]);
  });
  const out: Member[][] = [];
  for (const group of byRoot.values()) {
    if (group.length === 1 || diameterRatio(group, floor) <= repeatedPoleTolerance(group.length)) out.push(group);
    else out.push(...splitCluster(group, Math.min(level, group.length) - 1, floor));
  }
  return out;
}

function diameterRatio(group: Member[], floor: number): number {
  let worst = 0;
  for (let i = 0; i < group.length; i++) {
    for (let j = i + 1; j < group.length; j++) worst = Math.max(worst, distanceRatio(group[i]!.z, group[j]!.z, floor));
  }
  return worst;
}

function centerOf(group: Member[]): PoleCluster {
  const exact = group.filter((m) => m.exact);
  const source = exact.length > 0 ? exact : group;
  let re = 0;
  let im = 0;
  let minIm = Infinity;
  let maxIm = -Infinity;
  for (const m of source) {
    re += m.z.re;
    im += m.z.im;
  }
  for (const m of group) {
    minIm = Math.min(minIm, m.z.im);
    maxIm = Math.max(maxIm, m.z.im);
  }
  // A cluster straddling the real axis is its own conjugate: its center is real, whatever roundoff says.
  const straddles = minIm <= 0 && maxIm >= 0;
  return { center: { re: re / source.length, im: straddles ? 0 : im / source.length }, multiplicity: group.length };
}

/** Newton steps allowed when sharpening a repeated root; quadratic convergence needs a handful. */
export const SHARPEN_MAX_STEPS = 30;

/**
 * Replaces each cluster of computed roots of p by m copies of one sharpened center: an m-fold
 * root of p is a simple root of p^(m−1), so Newton on p^(m−1) from the cluster's mean lands on
 * it to working precision (for a genuinely split cluster it lands near the centroid, which is
 * what merging assumes). The root finder alone leaves an m-fold root scattered by ~ε^(1/m).
 * @example sharpenRepeatedRoots([8, 12, 6, 1], roots) // three copies of −2 to ~1e-15
 */
export function sharpenRepeatedRoots(p: readonly number[], roots: readonly Complex[]): Complex[] {
  const out: Complex[] = [];
  for (const cluster of clusterPoles(roots)) {
    const m = cluster.multiplicity;
    if (m === 1) {
      out.push(cluster.center);
      continue;
    }
    let d = p.slice();
    for (let k = 0; k < m - 1; k++) d = d.slice(1).map((c, i) => c * (i + 1));
    const sharpened = newtonOn(d, cluster.center);
    const scale = magnitude(cluster.center);
    const moved = magnitude({ re: sharpened.re - cluster.center.re, im: sharpened.im - cluster.center.im });
    // Keep the mean if Newton wandered off: a sharpened center stays within the cluster's own tolerance.
    const center = Number.isFinite(moved) && moved <= repeatedPoleTolerance(m) * scale ? sharpened : cluster.center;
    for (let k = 0; k < m; k++) out.push(center);
  }
  return out;
}

function newtonOn(p: readonly number[], start: Complex): Complex {
  let x = start.re;
  let y = start.im;
  const real = y === 0;
  for (let it = 0; it < SHARPEN_MAX_STEPS; it++) {
    const { pr, pi, dr, di } = valueAndSlope(p, x, y);
    const den = dr * dr + di * di;
    if (den === 0) break;
    const sx = (pr * dr + pi * di) / den;
    const sy = real ? 0 : (pi * dr - pr * di) / den;
    x -= sx;
    y -= sy;
    if (Math.hypot(sx, sy) <= 2 * Number.EPSILON * Math.hypot(x, y)) break;
  }
  return { re: x, im: y };
}
