import { describe, expect, it } from 'vitest';
import { traceHoldsFrom, traceStepMetrics } from './trace-step-metrics';

// A sampled unit-gain second-order step response with ζ = 0.3, ωn = 20 rad/s, stepping at 0.5 s:
// y = A(1 − e^(−ζωn τ)(cos ωd τ + ζ/√(1−ζ²) sin ωd τ)), τ = t − 0.5 (Ogata §5-3, from memory).
const zeta = 0.3;
const wn = 20;
const wd = wn * Math.sqrt(1 - zeta * zeta);
function trace(amplitude: number, horizon: number, dt = 0.001) {
  const n = Math.round(horizon / dt) + 1;
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = i * dt;
    const tau = t[i]! - 0.5;
    y[i] = tau < 0 ? 0 : amplitude * (1 - Math.exp(-zeta * wn * tau) * (Math.cos(wd * tau) + (zeta / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * tau)));
  }
  return { t, y };
}

describe('traceStepMetrics', () => {
  it('reads the textbook overshoot and a settling time inside the 2 % band off 1 ms samples', () => {
    const { t, y } = trace(0.5, 3);
    const m = traceStepMetrics(t, y, 0.5, 0.02);
    expect(m.overshootPercent).toBeCloseTo(100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta)), 3);
    // The settling time lies where the envelope e^(−ζωn τ)/√(1−ζ²) meets the band, or before it.
    const envelopeTime = -Math.log(0.02 * Math.sqrt(1 - zeta * zeta)) / (zeta * wn);
    expect(m.settlingTime!).toBeLessThanOrEqual(envelopeTime);
    expect(m.settlingTime!).toBeGreaterThan(envelopeTime - Math.PI / wd);
    expect(Math.abs(y[Math.round((0.5 + m.settlingTime! + 0.002) / 0.001)]! - 0.5)).toBeLessThanOrEqual(0.01);
  });

  it('measures a negative step the same way', () => {
    const up = trace(0.5, 3);
    const down = trace(-0.5, 3);
    const upward = traceStepMetrics(up.t, up.y, 0.5, 0.02);
    expect(traceStepMetrics(down.t, down.y, 0.5, 0.02)).toEqual({ ...upward, finalValue: -upward.finalValue! });
  });

  it('refuses to call a response settled when it is still outside the band in the last fifth of the run', () => {
    const { t, y } = trace(0.5, 0.8);
    const m = traceStepMetrics(t, y, 0.5, 0.02);
    expect(m).toMatchObject({ overshootPercent: null, settlingTime: null });
    expect(m.reason).toContain('not settled');
  });

  it('says a response ending at zero has no relative metrics', () => {
    const t = Float64Array.from([0, 0.1, 0.2, 0.3]);
    expect(traceStepMetrics(t, new Float64Array(4), 0, 0.02).reason).toContain('ends at zero');
  });

  it('tells whether a trace holds near its last value from a time on', () => {
    const { t, y } = trace(0.5, 3);
    expect(traceHoldsFrom(t, y, 2.4, 0.01)).toBe(true);
    expect(traceHoldsFrom(t, y, 0.6, 0.01)).toBe(false);
  });
});
