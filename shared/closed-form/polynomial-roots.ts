import { type Complex } from './complex-number';
import { divideByPowerOfS, trimPolynomial, zeroRootCount, type Polynomial } from './polynomial';

/** Aberth sweeps allowed before the root finder gives up; converging runs take 5–30. */
export const ROOT_MAX_ITERATIONS = 500;
/** Newton polishing steps per root on the original (unscaled) coefficients. */
export const ROOT_POLISH_STEPS = 2;

const EPS = Number.EPSILON;

/** Roots, or the reason none could be trusted. */
export type RootsResult = { ok: true; roots: Complex[] } | { ok: false; reason: string };

/**
 * All complex roots of a real polynomial: exact zero roots split off first, degree 1 and 2 in
 * closed form, higher degrees by the Aberth–Ehrlich simultaneous iteration with Newton polishing.
 * Conjugate pairs come back exactly conjugate. Sorted by real part, slowest (rightmost) first.
 * @example polynomialRoots([6, 11, 6, 1]) // roots −1, −2, −3 (to ~1e-15)
 */
export function polynomialRoots(p: Polynomial): RootsResult {
  const t = trimPolynomial(p);
  if (!t.every(Number.isFinite)) return { ok: false, reason: 'a polynomial coefficient is not finite' };
  if (t.length === 1) return t[0] === 0 ? { ok: false, reason: 'the zero polynomial has no isolated roots' } : { ok: true, roots: [] };
  const zeros = zeroRootCount(t);
  const q = divideByPowerOfS(t, zeros);
  const roots: Complex[] = [];
  for (let i = 0; i < zeros; i++) roots.push({ re: 0, im: 0 });
  const n = q.length - 1;
  if (n === 1) roots.push({ re: -q[0]! / q[1]!, im: 0 });
  else if (n === 2) roots.push(...quadraticRoots(q[2]!, q[1]!, q[0]!));
  else if (n > 2) {
    const found = aberthRoots(q);
    if (!found.ok) return found;
    const paired = pairConjugates(found.roots);
    if (!paired.ok) return paired;
    roots.push(...paired.roots);
  }
  roots.sort((a, b) => b.re - a.re || b.im - a.im);
  return { ok: true, roots };
}

/** Roots of a·s² + b·s + c with the cancellation-free form of the quadratic formula. */
function quadraticRoots(a: number, b: number, c: number): Complex[] {
  const disc = b * b - 4 * a * c;
  if (disc >= 0) {
    const qq = -0.5 * (b + Math.sign(b || 1) * Math.sqrt(disc));
    // qq = 0 only when b = 0 and c = 0, excluded because zero roots were split off.
    return [
      { re: qq / a, im: 0 },
      { re: c / qq, im: 0 },
    ];
  }
  const re = -b / (2 * a);
  const im = Math.sqrt(-disc) / (2 * Math.abs(a));
  return [
    { re, im },
    { re, im: -im },
  ];
}

function aberthRoots(coeffs: readonly number[]): RootsResult {
  const n = coeffs.length - 1;
  const lead = coeffs[n]!;
  const a = new Float64Array(n + 1);
  const absA = new Float64Array(n + 1);
  for (let i = 0; i <= n; i++) {
    a[i] = coeffs[i]! / lead;
    absA[i] = Math.abs(a[i]!);
  }
  const zr = new Float64Array(n);
  const zi = new Float64Array(n);
  const done = new Uint8Array(n);
  // Start on a circle of the roots' geometric-mean radius, rotated off the real axis so the
  // iteration does not start conjugate-symmetric and stall on a real double root.
  const radius = Math.pow(absA[0]!, 1 / n);
  for (let k = 0; k < n; k++) {
    const angle = (2 * Math.PI * k) / n + 0.4;
    zr[k] = radius * Math.cos(angle);
    zi[k] = radius * Math.sin(angle);
  }
  let converged = false;
  for (let iter = 0; iter < ROOT_MAX_ITERATIONS && !converged; iter++) {
    converged = true;
    for (let i = 0; i < n; i++) {
      if (done[i]) continue;
      const x = zr[i]!;
      const y = zi[i]!;
      let pr = 1;
      let pi = 0;
      let dr = 0;
      let di = 0;
      let bound = 1;
      const mod = Math.hypot(x, y);
      for (let k = n - 1; k >= 0; k--) {
        const ndr = dr * x - di * y + pr;
        di = dr * y + di * x + pi;
        dr = ndr;
        const npr = pr * x - pi * y + a[k]!;
        pi = pr * y + pi * x;
        pr = npr;
        bound = bound * mod + absA[k]!;
      }
      // Horner's rounding error bound: below it the value is noise and the root is as good as it gets.
      if (Math.hypot(pr, pi) <= 8 * EPS * bound) {
        done[i] = 1;
        continue;
      }
      converged = false;
      const den = dr * dr + di * di;
      if (den === 0) {
        // p' vanished away from a root: nudge the estimate instead of dividing by zero.
        zr[i] = x + radius * 1e-3;
        zi[i] = y + radius * 1e-3;
        continue;
      }
      const qr = (pr * dr + pi * di) / den;
      const qi = (pi * dr - pr * di) / den;
      let sr = 0;
      let si = 0;
      for (let j = 0; j < n; j++) {
        if (j === i) continue;
        const ur = x - zr[j]!;
        const ui = y - zi[j]!;
        const m = ur * ur + ui * ui;
        if (m === 0) continue; // coincident estimates: the other terms still separate them next sweep
        sr += ur / m;
        si -= ui / m;
      }
      const tr = 1 - (qr * sr - qi * si);
      const ti = -(qr * si + qi * sr);
      const tm = tr * tr + ti * ti;
      const wr = tm === 0 ? qr : (qr * tr + qi * ti) / tm;
      const wi = tm === 0 ? qi : (qi * tr - qr * ti) / tm;
      zr[i] = x - wr;
      zi[i] = y - wi;
      if (Math.hypot(wr, wi) <= EPS * Math.hypot(zr[i]!, zi[i]!)) done[i] = 1;
    }
  }
  if (!converged) return { ok: false, reason: `the root finder did not converge in ${ROOT_MAX_ITERATIONS} sweeps` };
  const roots: Complex[] = [];
  for (let i = 0; i < n; i++) {
    const r = polish(coeffs, zr[i]!, zi[i]!);
    if (!Number.isFinite(r.re) || !Number.isFinite(r.im)) return { ok: false, reason: 'a root came out non-finite' };
    roots.push(r);
  }
  return { ok: true, roots };
}

/** Newton steps on the original coefficients, kept only while they reduce |p|. */
function polish(c: readonly number[], x0: number, y0: number): Complex {
  let x = x0;
  let y = y0;
  let best = residual(c, x, y);
  for (let s = 0; s < ROOT_POLISH_STEPS; s++) {
    const { pr, pi, dr, di } = valueAndSlope(c, x, y);
    const den = dr * dr + di * di;
    if (den === 0) break;
    const nx = x - (pr * dr + pi * di) / den;
    const ny = y - (pi * dr - pr * di) / den;
    const r = residual(c, nx, ny);
    if (!(r < best)) break;
    best = r;
    x = nx;
    y = ny;
  }
  return { re: x, im: y };
}

/**
 * p(z) and p'(z) at z = x + iy by Horner's scheme, as real and imaginary parts.
 * @param c ascending real coefficients
 */
export function valueAndSlope(c: readonly number[], x: number, y: number) {
  let pr = 0;
  let pi = 0;
  let dr = 0;
  let di = 0;
  for (let k = c.length - 1; k >= 0; k--) {
    const ndr = dr * x - di * y + pr;
    di = dr * y + di * x + pi;
    dr = ndr;
    const npr = pr * x - pi * y + c[k]!;
    pi = pr * y + pi * x;
    pr = npr;
  }
  return { pr, pi, dr, di };
}

function residual(c: readonly number[], x: number, y: number): number {
  const { pr, pi } = valueAndSlope(c, x, y);
  return Math.hypot(pr, pi);
}

/**
 * Makes a real polynomial's roots exactly conjugate-symmetric: near-real roots become real,
 * the others are matched into pairs and averaged.
 */
function pairConjugates(roots: Complex[]): RootsResult {
  const out: Complex[] = [];
  const upper: Complex[] = [];
  const lower: Complex[] = [];
  for (const r of roots) {
    // A real root found from a complex start keeps an imaginary part at roundoff level.
    if (Math.abs(r.im) <= 16 * EPS * Math.abs(r.re)) out.push({ re: r.re, im: 0 });
    else (r.im > 0 ? upper : lower).push(r);
  }
  // Around a real multiple root the scatter can leave an odd member off the axis (a triple
  // root comes back as a triangle): the side with too many gives up its most nearly real roots.
  const byRealness = (a: Complex, b: Complex) => Math.abs(a.im) / Math.hypot(a.re, a.im) - Math.abs(b.im) / Math.hypot(b.re, b.im);
  while (upper.length !== lower.length) {
    const bigger = upper.length > lower.length ? upper : lower;
    bigger.sort(byRealness);
    out.push({ re: bigger.shift()!.re, im: 0 });
  }
  for (const u of upper) {
    let best = 0;
    let bestDist = Infinity;
    lower.forEach((l, j) => {
      const d = Math.hypot(u.re - l.re, u.im + l.im);
      if (d < bestDist) {
        bestDist = d;
        best = j;
      }
    });
    const l = lower.splice(best, 1)[0]!;
    const re = (u.re + l.re) / 2;
    const im = (u.im - l.im) / 2;
    out.push({ re, im }, { re, im: -im });
  }
  return { ok: true, roots: out };
}
