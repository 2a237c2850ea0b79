import { MAX_PATH_POINTS, scaleTraces } from './trace-scale';

describe('scaleTraces', () => {
  it('puts both traces on shared axes: the longer horizon spans the width, the joint angle range the height', () => {
    const a = { t: Float64Array.of(0, 1, 2), angle: Float64Array.of(0, 1, 1) };
    const b = { t: Float64Array.of(0, 1), angle: Float64Array.of(0, 2) };
    const scaled = scaleTraces([a, b], 200, 100);
    expect(scaled.tMax).toBe(2);
    expect(scaled.angleMin).toBeCloseTo(-0.1, 12);
    expect(scaled.angleMax).toBeCloseTo(2.1, 12);
    // angle 0 → y = 100 − (0.1/2.2)·100 = 95.45; angle 2 → 4.55; t = 1 → x = 100.
    expect(scaled.paths[0]).toBe('M0,95.45L100,50L200,50');
    expect(scaled.paths[1]).toBe('M0,95.45L100,4.55');
  });

  it('breaks the line at a non-finite sample instead of drawing it', () => {
    const scaled = scaleTraces([{ t: Float64Array.of(0, 1, 2, 3), angle: Float64Array.of(0, Number.NaN, 1, 1) }], 30, 10);
    expect(scaled.paths[0]!.match(/M/g)).toHaveLength(2);
  });

  it('draws a flat trace across the middle', () => {
    const scaled = scaleTraces([{ t: Float64Array.of(0, 1), angle: Float64Array.of(0.5, 0.5) }], 10, 10);
    expect(scaled.paths[0]).toBe('M0,5L10,5');
  });

  it('thins long traces to at most MAX_PATH_POINTS points', () => {
    const n = 4001;
    const t = Float64Array.from({ length: n }, (_, i) => i / 1000);
    const scaled = scaleTraces([{ t, angle: t.map(Math.sin) }], 600, 200);
    expect(scaled.paths[0]!.split(/[ML]/).filter(Boolean).length).toBeLessThanOrEqual(MAX_PATH_POINTS);
  });
});
