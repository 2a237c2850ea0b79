import { MAX_CHART_POINTS, chartBatchOfFrame, chartSpacing, latestAngle, latestTime } from './chart-points';

describe('chartBatchOfFrame', () => {
  it('keeps every sample of a clean frame, in order, and reports where it stopped', () => {
    const result = chartBatchOfFrame({ t: [0, 0.002, 0.004], angle: [0, 0.01, 0.03] }, Number.NEGATIVE_INFINITY, 0);
    expect(result.batch).toEqual({ t: [0, 0.002, 0.004], angle: [0, 0.01, 0.03] });
    expect(result.lastTime).toBe(0.004);
    expect(result.rejected).toBe(0);
  });

  it('continues from the previous frame and refuses samples at or before the last charted time', () => {
    const result = chartBatchOfFrame({ t: [0.004, 0.003, 0.006], angle: [9, 9, 0.05] }, 0.004, 0);
    expect(result.batch).toEqual({ t: [0.006], angle: [0.05] });
    expect(result.rejected).toBe(2);
  });

  it('refuses NaN and infinite values instead of drawing them', () => {
    const result = chartBatchOfFrame({ t: [0, 0.002, Number.NaN, 0.006], angle: [0, Number.POSITIVE_INFINITY, 1, 0.2] }, Number.NEGATIVE_INFINITY, 0);
    expect(result.batch).toEqual({ t: [0, 0.006], angle: [0, 0.2] });
    expect(result.rejected).toBe(2);
  });

  it('reads mismatched arrays only up to the shorter one and counts the rest as refused', () => {
    const result = chartBatchOfFrame({ t: [0, 0.002, 0.004], angle: [0.1] }, Number.NEGATIVE_INFINITY, 0);
    expect(result.batch).toEqual({ t: [0], angle: [0.1] });
    expect(result.rejected).toBe(2);
  });

  it('thins samples closer than the spacing without calling them wrong', () => {
    const t = Array.from({ length: 10 }, (_, i) => i * 0.1);
    const result = chartBatchOfFrame({ t, angle: t.map((x) => 2 * x) }, Number.NEGATIVE_INFINITY, 0.25);
    // Kept: 0, then the first sample at least 0.25 s later each time (0.3, 0.6, 0.9).
    expect(result.batch.t.map((x) => Number(x.toFixed(10)))).toEqual([0, 0.3, 0.6, 0.9]);
    expect(result.batch.angle.map((x) => Number(x.toFixed(10)))).toEqual([0, 0.6, 1.2, 1.8]);
    expect(result.rejected).toBe(0);
  });

  it('keeps a long run within MAX_CHART_POINTS when fed frame by frame', () => {
    const horizon = 3600;
    const dt = 0.002;
    const spacing = chartSpacing(horizon);
    let lastTime = Number.NEGATIVE_INFINITY;
    let kept = 0;
    // 1.8 million samples in 30 ms frames of 15, as the server would stream them.
    for (let start = 0; start * dt <= horizon; start += 15) {
      const t: number[] = [];
      for (let i = start; i < start + 15 && i * dt <= horizon; i++) t.push(i * dt);
      const result = chartBatchOfFrame({ t, angle: t }, lastTime, spacing);
      lastTime = result.lastTime;
      kept += result.batch.t.length;
    }
    expect(kept).toBeLessThanOrEqual(MAX_CHART_POINTS + 1);
    expect(kept).toBeGreaterThan(MAX_CHART_POINTS / 2);
    expect(lastTime).toBeGreaterThan(horizon - 2 * spacing);
  });
});

describe('chartSpacing', () => {
  it('divides the horizon by the point budget and keeps everything for a horizon it cannot use', () => {
    expect(chartSpacing(10)).toBeCloseTo(10 / MAX_CHART_POINTS, 15);
    expect(chartSpacing(0)).toBe(0);
    expect(chartSpacing(Number.NaN)).toBe(0);
    expect(chartSpacing(Number.POSITIVE_INFINITY)).toBe(0);
  });
});

describe('latestAngle and latestTime', () => {
  it('take the newest finite sample of a frame', () => {
    const frame = { t: [0, 0.002, 0.004], angle: [0.1, 0.2, Number.NaN] };
    expect(latestAngle(frame)).toBe(0.2);
    expect(latestTime(frame)).toBe(0.002);
  });

  it('give null for a frame with nothing drawable', () => {
    expect(latestAngle({ t: [], angle: [] })).toBeNull();
    expect(latestTime({ t: [Number.NaN], angle: [1] })).toBeNull();
  });
});
