import { describe, expect, it } from 'vitest';
import { createTwinRun } from '../twin/twin-run';
import { parseTwinScenario, twinScenarioErrors } from '../twin/twin-scenario-errors';
import { parseScenario } from './parse-scenario';
import { NONLINEAR_DEFAULTS, resolveNonlinear } from './nonlinear-schema';

const doc = (nonlinear: unknown, controller: object = { mode: 'pid', kp: 8, kd: 0.6 }) => ({
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'nonlinear test',
  joint: { inertia: 0.05, damping: 0.02, stiffness: 0 },
  controller,
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5 }],
  horizon: 2,
  ...(nonlinear === undefined ? {} : { nonlinear }),
});

const errorsOf = (input: unknown) => {
  const parsed = parseScenario(input);
  return parsed.ok ? [] : parsed.errors;
};

describe('the nonlinear block', () => {
  it('is optional and resolves to every effect off', () => {
    const parsed = parseScenario(doc(undefined));
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
    expect(resolveNonlinear(parsed.value.nonlinear)).toEqual({
      torqueLimit: Infinity,
      antiWindup: true,
      coulombFriction: 0,
      staticFriction: 0,
      gravityTorque: 0,
      gravityOffset: 0,
      torqueOffset: 0,
      deadBand: 0,
      computeDelay: false,
      encoderCounts: 0,
      noiseStdDev: 0,
      noiseSeed: NONLINEAR_DEFAULTS.noiseSeed,
    });
  });

  it('fills the documented defaults of a partial block', () => {
    const nl = resolveNonlinear({ coulombFriction: 0.2, gravity: { mass: 2, arm: 0.5 } });
    expect(nl.staticFriction).toBe(0.2);
    expect(nl.gravityTorque).toBeCloseTo(2 * 9.80665 * 0.5, 12);
    expect(nl.gravityOffset).toBe(0);
  });

  it.each([
    [{ torqueLimit: Number.NaN }, 'nonlinear.torqueLimit', /finite number/],
    [{ torqueLimit: 0 }, 'nonlinear.torqueLimit', /positive/],
    [{ coulombFriction: -0.1 }, 'nonlinear.coulombFriction', /zero or more/],
    [{ coulombFriction: 0.3, staticFriction: 0.2 }, 'nonlinear.staticFriction', /at least coulombFriction \(0.3 N·m\), got 0.2/],
    [{ gravity: { mass: -1, arm: 0.2 } }, 'nonlinear.gravity.mass', /positive/],
    [{ gravity: { mass: 1 } }, 'nonlinear.gravity.arm', /required/],
    [{ deadBand: Number.POSITIVE_INFINITY }, 'nonlinear.deadBand', /finite number/],
    [{ encoderCounts: 0 }, 'nonlinear.encoderCounts', /positive/],
    [{ encoderCounts: 1000.5 }, 'nonlinear.encoderCounts', /whole number/],
    [{ noiseStdDev: -1 }, 'nonlinear.noiseStdDev', /zero or more/],
    [{ noiseSeed: -3 }, 'nonlinear.noiseSeed', /zero or more/],
    [{ antiWindup: 'yes' }, 'nonlinear.antiWindup', /true or false/],
    [{ backlashWidth: 0.1 }, 'nonlinear', /backlashWidth/],
  ])('refuses %j naming the field', (nonlinear, field, message) => {
    const errors = errorsOf(doc(nonlinear));
    expect(errors).toContainEqual({ field, message: expect.stringMatching(message) });
  });

  it('refuses a negative or zero sample period', () => {
    expect(errorsOf(doc({}, { mode: 'pid', kp: 1, samplePeriod: -0.001 }))).toContainEqual({ field: 'controller.samplePeriod', message: 'samplePeriod must be positive' });
    expect(errorsOf(doc({}, { mode: 'pid', kp: 1, samplePeriod: 0 }))).toContainEqual({ field: 'controller.samplePeriod', message: 'samplePeriod must be positive' });
  });
});

describe('twin-only cross-field checks', () => {
  it('asks for a sampled controller before measurement effects', () => {
    const parsed = parseTwinScenario(doc({ encoderCounts: 4096, noiseStdDev: 1e-4 }));
    expect(parsed).toEqual({
      ok: false,
      errors: [
        { field: 'nonlinear.encoderCounts', message: 'encoderCounts acts on a sampled measurement: set controller.samplePeriod' },
        { field: 'nonlinear.noiseStdDev', message: 'noiseStdDev acts on a sampled measurement: set controller.samplePeriod' },
      ],
    });
    expect(parseTwinScenario(doc({ encoderCounts: 4096 }, { mode: 'pid', kp: 8, samplePeriod: 0.001 })).ok).toBe(true);
  });

  it('refuses more controller samples than the cap and never starts such a run', () => {
    const parsed = parseScenario({ ...doc({}, { mode: 'pid', kp: 8, samplePeriod: 1e-7 }), horizon: 3600 });
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
    expect(twinScenarioErrors(parsed.value)).toEqual([{ field: 'controller.samplePeriod', message: expect.stringMatching(/more than 10000000 samples/) }]);
    expect(() => createTwinRun(parsed.value)).toThrow(RangeError);
  });
});
