import { describe, expect, it } from 'vitest';
import { checkLimits } from './limits-check';

const metrics = { riseTime: 0.2, overshootPercent: 16.3, peakTime: 0.5, settlingTime: 1.2, steadyStateError: -0.004 };

describe('checkLimits', () => {
  it('skips null limits and judges the rest', () => {
    const v = checkLimits({ overshootPercent: 20, settlingTime: 1, steadyStateError: null }, metrics, null);
    expect(v).toEqual([
      { limit: 'overshootPercent', bound: 20, value: 16.3, met: true, reason: null },
      { limit: 'settlingTime', bound: 1, value: 1.2, met: false, reason: 'settlingTime 1.2 exceeds the limit 1' },
    ]);
  });

  it('judges the magnitude of the steady-state error', () => {
    expect(checkLimits({ overshootPercent: null, settlingTime: null, steadyStateError: 0.005 }, metrics, null)[0]).toMatchObject({ value: 0.004, met: true });
  });

  it('never passes an undefined metric', () => {
    const none = { riseTime: null, overshootPercent: null, peakTime: null, settlingTime: null, steadyStateError: null };
    const v = checkLimits({ overshootPercent: 10, settlingTime: null, steadyStateError: null }, none, 'the loop is not stable');
    expect(v[0]).toMatchObject({ met: false, value: null, reason: 'overshootPercent is undefined: the loop is not stable' });
  });
});
