import { describe, expect, it } from 'vitest';
import { limitVerdicts } from './limit-verdicts';

const metrics = { riseTime: 0.1, overshootPercent: 16.3, peakTime: 0.2, settlingTime: 0.5, steadyStateError: -0.002 };

describe('limitVerdicts', () => {
  it('judges each set limit, the steady-state error by its size, and skips unset ones', () => {
    expect(limitVerdicts({ overshootPercent: 20, settlingTime: 0.4, steadyStateError: 0.002 }, metrics)).toEqual({
      overshootPercent: { bound: 20, value: 16.3, met: true },
      settlingTime: { bound: 0.4, value: 0.5, met: false },
      steadyStateError: { bound: 0.002, value: 0.002, met: true },
    });
    expect(limitVerdicts({ overshootPercent: null, settlingTime: null, steadyStateError: null }, metrics)).toEqual({});
  });

  it('never calls an undefined metric met', () => {
    const undefinedMetrics = { riseTime: null, overshootPercent: null, peakTime: null, settlingTime: null, steadyStateError: null };
    expect(limitVerdicts({ overshootPercent: 100, settlingTime: null, steadyStateError: 1 }, undefinedMetrics)).toEqual({
      overshootPercent: { bound: 100, value: null, met: false },
      steadyStateError: { bound: 1, value: null, met: false },
    });
  });
});
