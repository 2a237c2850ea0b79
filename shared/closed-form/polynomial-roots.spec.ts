import fc from 'fast-check';
import { eigs } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { absComplex, type Complex } from './complex-number';
import { evaluatePolynomialComplex, polynomialFromRoots } from './polynomial';
import { polynomialRoots } from './polynomial-roots';
import { clusterPoles, sharpenRepeatedRoots } from './pole-clusters';

/** Eigenvalues of the companion matrix (mathjs), the reference root finder. */
function companionRoots(p: number[]): Complex[] {
  const n = p.length - 1;
  const lead = p[n]!;
  const m: number[][] = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j + 1 ? 1 : 0)));
  for (let i = 0; i < n; i++) m[i]![n - 1] = -p[i]! / lead;
  const values = eigs(m).values as unknown as (number | { re: number; im: number })[] | { toArray(): (number | { re: number; im: number })[] };
  const list = Array.isArray(values) ? values : values.toArray();
  return list.map((v) => (typeof v === 'number' ? { re: v, im: 0 } : { re: v.re, im: v.im }));
}

function matchDistance(a: Complex[], b: Complex[]): number {
  const rest = b.slice();
  let worst = 0;
  for (const z of a) {
    let best = 0;
    rest.forEach((w, j) => {
      if (absComplex({ re: z.re - w.re, im: z.im - w.im }) < absComplex({ re: z.re - rest[best]!.re, im: z.im - rest[best]!.im })) best = j;
    });
    const w = rest.splice(best, 1)[0]!;
    worst = Math.max(worst, absComplex({ re: z.re - w.re, im: z.im - w.im }) / Math.max(1, absComplex(z)));
  }
  return worst;
}

describe('polynomialRoots (Aberth–Ehrlich with polishing)', () => {
  it('finds the roots of (s+1)(s+2)(s+3)', () => {
    const r = polynomialRoots([6, 11, 6, 1]);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.roots.map((z) => z.re)).toEqual([expect.closeTo(-1, 14), expect.closeTo(-2, 14), expect.closeTo(-3, 14)]);
  });

  it('splits exact zero roots off and handles degrees 1 and 2 in closed form', () => {
    const r = polynomialRoots([0, 0, 5, 1]);
    expect(r).toEqual({ ok: true, roots: [{ re: 0, im: 0 }, { re: 0, im: 0 }, { re: -5, im: 0 }] });
    const q = polynomialRoots([4, 0, 1]);
    expect(q).toEqual({ ok: true, roots: [{ re: -0, im: 2 }, { re: -0, im: -2 }] });
  });

  it('agrees with the eigenvalues of the companion matrix (mathjs eigs) on random polynomials', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -100, max: 100 }), { minLength: 4, maxLength: 8 }), (ints) => {
        const p = [...ints.slice(0, -1).map((k) => k / 10), 1 + Math.abs(ints[ints.length - 1]!) / 10];
        if (p[0] === 0) p[0] = 1;
        const ours = polynomialRoots(p);
        expect(ours.ok).toBe(true);
        if (!ours.ok) return;
        let theirs: Complex[];
        try {
          theirs = companionRoots(p);
        } catch {
          // mathjs's nonsymmetric eigensolver gives up on some companion matrices; skip those draws.
          fc.pre(false);
          return;
        }
        const clusters = clusterPoles(ours.roots);
        // Near-multiple roots are ill-conditioned for both methods; compare well-separated sets.
        if (clusters.some((c) => c.multiplicity > 1)) return;
        expect(matchDistance(ours.roots, theirs)).toBeLessThan(1e-7);
        for (const z of ours.roots) expect(absComplex(evaluatePolynomialComplex(p, z))).toBeLessThan(1e-8 * Math.max(1, absComplex(z) ** (p.length - 1)));
      }),
      { numRuns: 40, seed: 7 },
    );
  });

  it('returns conjugate pairs exactly conjugate', () => {
    const r = polynomialRoots(polynomialFromRoots([{ re: -1, im: 3 }, { re: -1, im: -3 }, { re: -0.5, im: 0.2 }, { re: -0.5, im: -0.2 }, { re: -7, im: 0 }]));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const upper = r.roots.filter((z) => z.im > 0);
    for (const u of upper) expect(r.roots).toContainEqual({ re: u.re, im: -u.im });
  });

  it('sharpens a triple and a quadruple root to working precision', () => {
    for (const [p, root, m] of [
      [[8, 12, 6, 1], -2, 3],
      [[16, 32, 24, 8, 1], -2, 4],
    ] as const) {
      const r = polynomialRoots([...p]);
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const sharp = sharpenRepeatedRoots([...p], r.roots);
      expect(sharp).toHaveLength(m);
      for (const z of sharp) expect(Math.abs(z.re - root) + Math.abs(z.im)).toBeLessThan(1e-12);
    }
  });

  it('reports non-finite coefficients and the zero polynomial as errors', () => {
    expect(polynomialRoots([1, Number.NaN, 1]).ok).toBe(false);
    expect(polynomialRoots([0]).ok).toBe(false);
  });
});
