import { describe, expect, it } from 'vitest';
import type { TwinTrace } from '../../shared/twin/twin-run';
import { concatTrace, countUpTo, sliceTrace, TraceHistory } from './trace-buffer';

function trace(from: number, count: number, dt = 0.01): TwinTrace {
  const t = Float64Array.from({ length: count }, (_, i) => (from + i) * dt);
  return {
    t,
    angle: t.map((x) => x * 2),
    velocity: t.map(() => 2),
    controllerTorque: t.map(() => 0),
    appliedTorque: t.map(() => 0),
    saturating: new Uint8Array(count),
    sticking: new Uint8Array(count).fill(1),
  };
}

describe('trace buffer', () => {
  it('slices, joins and counts by time', () => {
    const joined = concatTrace(trace(0, 5), trace(5, 5));
    expect(joined.t).toHaveLength(10);
    expect(joined.t[9]).toBeCloseTo(0.09, 12);
    expect(countUpTo(joined, 0.045)).toBe(5);
    expect(countUpTo(joined, -1)).toBe(0);
    expect(countUpTo(joined, 1)).toBe(10);
    expect(Array.from(sliceTrace(joined, 2, 4).angle)).toEqual([0.04, 0.06]);
  });

  it('finds the nearest kept sample and forgets the oldest beyond its capacity', () => {
    const history = new TraceHistory(25);
    for (let k = 0; k < 5; k++) history.append(trace(k * 10, 10));
    // 50 samples appended, room for 25: whole chunks before t = 0.2 s are gone.
    expect(history.earliest).toBeCloseTo(0.2, 12);
    expect(history.nearest(0.333)).toMatchObject({ t: expect.closeTo(0.33, 12), angle: expect.closeTo(0.66, 12), sticking: true });
    expect(history.nearest(5)!.t).toBeCloseTo(0.49, 12);
    expect(new TraceHistory(10).nearest(0)).toBeNull();
  });
});
