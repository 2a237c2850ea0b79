import { describe, expect, it } from 'vitest';
import { quantile, timeWork, warmUpRuns } from './time-command';

describe('kinetwin time: the timing arithmetic', () => {
  it('quantiles interpolate linearly between ranks (Hyndman & Fan 1996, definition 7, the default of R and NumPy; from memory)', () => {
    expect(quantile([1, 2, 3, 4], 0.5)).toBe(2.5);
    expect(quantile([1, 2, 3, 4], 0.1)).toBeCloseTo(1.3, 12);
    expect(quantile([1, 2, 3, 4], 0.9)).toBeCloseTo(3.7, 12);
    expect(quantile([7], 0.9)).toBe(7);
  });

  it('warms up before timing, times every run, and reports p10 ≤ median ≤ p90 of the timed runs only', () => {
    let clock = 0;
    let calls = 0;
    // Run i takes i ms on the fake clock: warm-up runs are slow ones that must not be counted.
    const work = () => {
      calls++;
      clock += calls;
      return { ok: true as const, samples: 11 };
    };
    const r = timeWork(work, 'sim', 10, () => clock);
    if (!r.ok) throw new Error(r.reason);
    expect(calls).toBe(warmUpRuns(10) + 10);
    const first = warmUpRuns(10) + 1;
    expect(r.report).toEqual({ method: 'sim', runs: 10, median_ms: first + 4.5, p10_ms: first + 0.9, p90_ms: first + 8.1, samples: 11 });
  });

  it('stops at the first run that fails and says why', () => {
    let calls = 0;
    const r = timeWork(() => (++calls < 3 ? { ok: true as const, samples: 1 } : { ok: false as const, reason: 'the twin stopped early' }), 'sim', 10, () => 0);
    expect(r).toEqual({ ok: false, reason: 'the twin stopped early' });
    expect(calls).toBe(3);
  });
});
