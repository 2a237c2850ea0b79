import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { gridLength, interpolateLinear, uniformGrid } from './log-resample';
import { SAMPLE_BLOCK, SampleBuffer } from './log-sample-buffer';
import { gapsOf, selectKth, timingOf } from './log-timing';

describe('selectKth', () => {
  it('agrees with a sort for any array and rank', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: 1, maxLength: 200 }), fc.nat(), (values, k) => {
        const rank = k % values.length;
        const sorted = [...values].sort((a, b) => a - b);
        expect(selectKth(Float64Array.from(values), rank)).toBe(sorted[rank]);
      }),
    );
  });
});

describe('timingOf and gapsOf', () => {
  it('finds the median step, the spread and uniformity', () => {
    const t = Float64Array.from([0, 0.001, 0.002, 0.003, 0.004]);
    expect(timingOf(t)).toMatchObject({ start: 0, end: 0.004, uniform: true });
    expect(timingOf(t).medianStep).toBeCloseTo(0.001, 15);
    const uneven = timingOf(Float64Array.from([0, 0.001, 0.0025, 0.003, 0.0041]));
    expect(uneven.uniform).toBe(false);
    expect(uneven.minStep).toBeCloseTo(0.0005, 12);
    expect(uneven.maxStep).toBeCloseTo(0.0015, 12);
  });

  it('counts rounding of printed times as uniform (within 1 %)', () => {
    // 1 kHz logged with 4 decimals of ms: steps 0.9995 to 1.0005 ms.
    const t = Float64Array.from([0, 0.0009995, 0.002, 0.0030005, 0.004]);
    expect(timingOf(t).uniform).toBe(true);
  });

  it('lists steps over the factor as gaps', () => {
    const t = Float64Array.from([0, 1, 2, 10, 11, 30]);
    expect(gapsOf(t, 1, 5)).toEqual([
      { index: 2, step: 8 },
      { index: 4, step: 19 },
    ]);
  });
});

describe('resampling', () => {
  it('builds the grid from an index and keeps a whole-step end', () => {
    expect(gridLength(0, 1, 0.1)).toBe(11);
    expect(gridLength(0, 0.95, 0.1)).toBe(10);
    const grid = uniformGrid(0, 0.1, 11);
    expect(grid[10]).toBe(1);
  });

  it('interpolates linearly and reproduces the samples at their own times', () => {
    const time = Float64Array.from([0, 1, 3]);
    const values = Float64Array.from([0, 10, 30]);
    expect(Array.from(interpolateLinear(time, values, Float64Array.from([0, 0.5, 1, 2, 3])))).toEqual([0, 5, 10, 20, 30]);
  });

  it('stays finite between the largest doubles', () => {
    const out = interpolateLinear(Float64Array.from([0, 1]), Float64Array.from([-1.7e308, 1.7e308]), Float64Array.from([0.5]));
    expect(Number.isFinite(out[0]!)).toBe(true);
  });
});

describe('SampleBuffer', () => {
  it('keeps values in order across blocks and releases them on take', () => {
    const buffer = new SampleBuffer();
    const n = SAMPLE_BLOCK * 2 + 3;
    for (let i = 0; i < n; i++) buffer.push(i * 0.5);
    expect(buffer.length).toBe(n);
    expect(buffer.at(SAMPLE_BLOCK)).toBe(SAMPLE_BLOCK * 0.5);
    expect(buffer.last()).toBe((n - 1) * 0.5);
    const all = buffer.take();
    expect(all.length).toBe(n);
    expect(all[n - 1]).toBe((n - 1) * 0.5);
    expect(buffer.length).toBe(0);
  });
});
