import { describe, expect, it } from 'vitest';
import { buildScenario } from '../twin/testing/build-scenario';
import { twinAgainstClosedForm } from './closed-form-angle';
import { compareWithClosedForm } from './twin-vs-closed-form';

describe('compareWithClosedForm', () => {
  it('reports the residual trace, RMS, max error and its time', () => {
    const t = Float64Array.from([0, 1, 2, 3]);
    const angle = Float64Array.from([0, 1.1, 2, 2.7]);
    const report = compareWithClosedForm({ t, angle }, (times) => times.map((x) => x));
    expect(Array.from(report.residual)).toEqual([0, 0.10000000000000009, 0, -0.2999999999999998]);
    expect(report.rms).toBeCloseTo(Math.sqrt((0.01 + 0.09) / 4), 12);
    expect(report.maxError).toBeCloseTo(0.3, 12);
    expect(report.timeOfMaxError).toBe(3);
    expect(report.peak).toBe(3);
    expect(report.relativeMaxError).toBeCloseTo(0.1, 12);
  });

  it('refuses a closed form of the wrong length or with a non-finite value', () => {
    const t = Float64Array.from([0, 1]);
    expect(() => compareWithClosedForm({ t, angle: t }, () => new Float64Array(3))).toThrow(/3 values for 2 times/);
    expect(() => compareWithClosedForm({ t, angle: t }, () => Float64Array.from([0, NaN]))).toThrow(/not finite at t = 1/);
  });
});

describe('twin against the closed-form engine, every effect off', () => {
  const cases = {
    'PD step, derivative on measurement': buildScenario(),
    'PID with filter, pulse reference and sine torque': buildScenario({
      joint: { inertia: 0.05, damping: 0.02, stiffness: 0.3, gearRatio: 1.5 },
      controller: { mode: 'pid', kp: 8, ki: 2, kd: 0.6, derivativeFilter: 0.01, derivativeOn: 'error' },
      inputs: [
        { channel: 'reference', shape: 'pulse', amplitude: 0.4, delay: 0.2, width: 0.5 },
        { channel: 'torque', shape: 'sine', amplitude: 0.05, frequency: 9, delay: 0.37 },
      ],
      horizon: 3,
    }),
    'open loop, impulse and decay': buildScenario({
      joint: { inertia: 0.5, damping: 0.25, stiffness: 2 },
      controller: { mode: 'open-loop' },
      inputs: [
        { channel: 'torque', shape: 'impulse', amplitude: 0.1, delay: 0.3 },
        { channel: 'torque', shape: 'decay', amplitude: 0.2, rate: 3, delay: 0.1 },
      ],
      initial: { angle: 0.05, velocity: 0 },
      horizon: 4,
    }),
  };
  for (const [name, scenario] of Object.entries(cases)) {
    it(`agrees within 1e-6 of the peak: ${name}`, () => {
      const result = twinAgainstClosedForm(scenario, { dt: 0.001 });
      if (!result.ok) throw new Error(JSON.stringify(result.errors));
      expect(result.value.twinStop).toBeNull();
      expect(result.value.peak).toBeGreaterThan(0);
      expect(result.value.relativeMaxError).toBeLessThan(1e-6);
    });
  }
});
