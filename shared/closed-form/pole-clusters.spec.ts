import { describe, expect, it } from 'vitest';
import { clusterPoles, repeatedPoleTolerance } from './pole-clusters';

describe('clusterPoles', () => {
  it('merges roots scattered by roundoff around a double pole', () => {
    const c = clusterPoles([
      { re: -1, im: 1e-8 },
      { re: -1, im: -1e-8 },
    ]);
    expect(c).toEqual([{ center: { re: -1, im: 0 }, multiplicity: 2 }]);
  });

  it('keeps genuinely distinct poles apart', () => {
    const c = clusterPoles([
      { re: -1, im: 0 },
      { re: -1.001, im: 0 },
    ]);
    expect(c.map((x) => x.multiplicity)).toEqual([1, 1]);
  });

  it('lets an exact input pole set the center of the cluster it joins', () => {
    const c = clusterPoles([{ re: -1 + 1e-13, im: 0 }], [{ re: -1, im: 0 }]);
    expect(c).toEqual([{ center: { re: -1, im: 0 }, multiplicity: 2 }]);
  });

  it('merges complex pairs into repeated pairs, conjugates kept', () => {
    const c = clusterPoles([], [
      { re: 0, im: 2 },
      { re: 0, im: -2 },
    ]);
    expect(c).toHaveLength(2);
    const d = clusterPoles([{ re: 1e-17, im: 2 }, { re: 1e-17, im: -2 }], [{ re: 0, im: 2 }, { re: 0, im: -2 }]);
    expect(d).toEqual([
      { center: { re: 0, im: 2 }, multiplicity: 2 },
      { center: { re: 0, im: -2 }, multiplicity: 2 },
    ]);
  });

  it('uses a tolerance that widens with multiplicity', () => {
    expect(repeatedPoleTolerance(2)).toBeCloseTo(6.06e-6, 7);
    expect(repeatedPoleTolerance(3)).toBeGreaterThan(repeatedPoleTolerance(2));
  });
});
