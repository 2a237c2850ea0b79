import { describe, expect, it } from 'vitest';
import { chooseIntegratorRegime, integralOnLimit, integratorEvent, onLimit, pidRequest, slidingIntegralRate, type ContinuousPidGains } from './continuous-pid';

const gains: ContinuousPidGains = { kp: 10, ki: 50, kd: 0.1, derivativeFilter: 0, derivativeOnError: false, gearRatio: 2, torqueLimit: 1, antiWindup: true };

describe('the continuous PID’s anti-windup regime', () => {
  it('puts the request exactly on the limit and recognises it there', () => {
    const integral = integralOnLimit(gains, -1, -0.1, 0.3);
    expect(pidRequest(gains, -0.1, integral, 0.3)).toBeCloseTo(-1, 14);
    expect(onLimit(gains, -0.1, integral, 0.3)).toBe(true);
    expect(onLimit(gains, -0.1, integral + 1e-6, 0.3)).toBe(false);
  });

  it('holds u′ = 0 with the sliding rate: N·(frozen rate + ki·rate) = 0', () => {
    const frozen = -2;
    const rate = slidingIntegralRate(gains, frozen);
    expect(gains.gearRatio * (frozen / gains.gearRatio + gains.ki * rate)).toBeCloseTo(0, 14);
  });

  // Filippov's construction (Filippov 1988, §2.4, from memory): on the limit the sign of u′ with
  // the integral frozen (α = 0) and running (α = 1) decides; with e = 0.1 and N·ki·e = 10 N·m/s.
  it.each([
    ['frozen: even a frozen integrator pushes u out', 3, 'frozen'],
    ['sliding: frozen pulls u in, running pushes it out', -4, 'sliding'],
    ['integrating: even a running integrator pulls u in', -12, 'integrating'],
  ] as const)('chooses %s, and the chosen regime’s event is not positive', (_case, frozenRate, mode) => {
    const rate = slidingIntegralRate(gains, frozenRate);
    const regime = chooseIntegratorRegime(gains, 1, 0.1, rate, true);
    expect(regime).toEqual({ mode, side: 1 });
    expect(integratorEvent(gains, regime, 1, 0.1, rate)).toBeLessThanOrEqual(0);
  });

  it('integrates whenever the error pulls the request back, and off the limit follows the clamping rule', () => {
    expect(chooseIntegratorRegime(gains, 3, -0.1, 0, false).mode).toBe('integrating');
    expect(chooseIntegratorRegime(gains, -3, -0.1, 0, false)).toEqual({ mode: 'frozen', side: -1 });
    expect(chooseIntegratorRegime(gains, 0.5, 0.1, 0, false).mode).toBe('integrating');
  });

  it('ends each regime at its boundary', () => {
    const integrating = { mode: 'integrating', side: 1 } as const;
    expect(integratorEvent(gains, integrating, 0.9, 0.1, 0)).toBeLessThan(0);
    expect(integratorEvent(gains, integrating, 1.1, 0.1, 0)).toBeGreaterThan(0);
    expect(integratorEvent(gains, integrating, 1.1, -0.1, 0)).toBeLessThan(0);
    const frozen = { mode: 'frozen', side: -1 } as const;
    expect(integratorEvent(gains, frozen, -1.1, -0.1, 0)).toBeLessThan(0);
    expect(integratorEvent(gains, frozen, -0.9, -0.1, 0)).toBeGreaterThan(0);
    expect(integratorEvent(gains, frozen, -1.1, 0.01, 0)).toBeGreaterThan(0);
    const sliding = { mode: 'sliding', side: 1 } as const;
    expect(integratorEvent(gains, sliding, 1, 0.1, 0.05)).toBeLessThan(0);
    expect(integratorEvent(gains, sliding, 1, 0.1, -0.01)).toBeGreaterThan(0);
    expect(integratorEvent(gains, sliding, 1, 0.1, 0.11)).toBeGreaterThan(0);
  });
});
