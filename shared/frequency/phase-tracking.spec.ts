import { describe, expect, it } from 'vitest';
import { complex, divideComplex } from '../closed-form/complex-number';
import { rationalChannel, type FrequencyChannel } from './frequency-channel';
import { lowFrequencyPhaseDeg, trackPhase } from './phase-tracking';

const DEG = 180 / Math.PI;

describe('phase tracking', () => {
  it('unwraps 1/(s + 1)⁴ to −4·atan ω all the way to −360° (each real pole a lag of atan(ω/p); common practice)', () => {
    const channel = rationalChannel({ num: [1], den: [1, 4, 6, 4, 1] });
    const w = [0.01, 0.3, 1, 3, 30, 1000];
    trackPhase(channel, w).forEach((p, i) => expect(p).toBeCloseTo(-4 * Math.atan(w[i]!) * DEG, 9));
  });

  it('follows a delay for many turns: e^(−sτ)/(s + 1) has phase −atan ω − ωτ', () => {
    const tau = 0.05;
    const channel: FrequencyChannel = {
      at: (x) => divideComplex(complex(1), complex(1, x)),
      rational: { num: [1], den: [1, 1] },
      delay: tau,
      innerDelay: 0,
    };
    // A sparse grid: 10 points over four decades, the last where the delay has turned 200 times.
    const w = Array.from({ length: 10 }, (_, i) => 10 ** (i * (4 / 9) + 0.7));
    trackPhase(channel, w).forEach((p, i) => expect(p).toBeCloseTo(-Math.atan(w[i]!) * DEG - w[i]! * tau * DEG, 6));
  });

  it('starts each channel on its low-frequency asymptote: integrators lag 90° each, a negative gain adds a half turn', () => {
    expect(lowFrequencyPhaseDeg({ num: [1], den: [0, 0, 1] })).toBe(-180);
    expect(lowFrequencyPhaseDeg({ num: [0, 2], den: [1, 1] })).toBe(90);
    expect(lowFrequencyPhaseDeg({ num: [-1], den: [1, 1] })).toBe(-180);
    const doubleIntegratorWithLead = rationalChannel({ num: [1, 10], den: [0, 0, 1] });
    const [low, high] = trackPhase(doubleIntegratorWithLead, [1e-4, 1e4]);
    expect(low).toBeCloseTo(-180 + Math.atan(1e-3) * DEG, 9);
    expect(high).toBeCloseTo(-180 + Math.atan(1e5) * DEG, 9);
  });
});
