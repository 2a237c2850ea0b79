import { describe, expect, it } from 'vitest';
import { buildScenario } from '../twin/testing/build-scenario';
import { linearRange } from './linear-range';
import { shiftCheck } from './shift-check';
import { superpositionCheck } from './superposition-check';
import { zeroStateWith } from './check-verdict';
import { simulateTwin } from '../twin/twin-run';

const pid = buildScenario({ controller: { mode: 'pid', kp: 8, ki: 2, kd: 0.6, derivativeOn: 'error', derivativeFilter: 0.005 }, horizon: 2 });
const sampled = buildScenario({ controller: { mode: 'pid', kp: 8, kd: 0.6, derivativeOn: 'measurement', samplePeriod: 0.01 }, horizon: 1.5 });
// Open loop driven by a torque ramp τ = t through a 1.4 N·m drive limit: the 2·u1 run asks for
// 2·t and reaches the limit first, at t = 0.7 s (u1 alone would at 1.4 s, u1 + u2 at 1.2 s).
const rampThroughLimit = buildScenario({
  joint: { inertia: 0.05, damping: 0.2, stiffness: 1 },
  controller: { mode: 'open-loop' },
  inputs: [{ channel: 'torque', shape: 'ramp', amplitude: 1 }],
  horizon: 3,
  nonlinear: { torqueLimit: 1.4 },
});

describe('superposition check', () => {
  it('passes for a linear scenario, continuous or sampled', () => {
    for (const s of [pid, sampled]) {
      const result = superpositionCheck(s);
      expect(result.pass).toBe(true);
      expect(result.worst).toBeLessThan(1e-8);
      expect(result.reason).toMatch(/^superposition holds/);
      expect(result.effects).toEqual([]);
    }
  });

  it('gives the same verdict when the caller hands it the u1 run it already has', () => {
    const twin = { dt: 0.001 };
    const u1Run = simulateTwin(zeroStateWith(rampThroughLimit, rampThroughLimit.inputs), twin);
    expect(superpositionCheck(rampThroughLimit, { twin, u1Run })).toEqual(superpositionCheck(rampThroughLimit, { twin }));
  });

  it('fails under a torque limit and says which run hit it and when', () => {
    const result = superpositionCheck(rampThroughLimit);
    expect(result.pass).toBe(false);
    expect(result.worst).toBeGreaterThan(result.threshold);
    expect(result.reason).toMatch(/^torque limit ±1.4 N·m reached at t = 0.70[01] s in the 2·u1 run; y\(2·u1\) departs from 2·y1 by/);
    expect(result.firstExceeded).toBeGreaterThanOrEqual(0.7);
  });

  it('passes when the limit is never reached', () => {
    const result = superpositionCheck({ ...rampThroughLimit, nonlinear: { torqueLimit: 7 } });
    expect(result.pass).toBe(true);
  });

  it('fails when static friction holds the joint against the input', () => {
    const stuck = buildScenario({
      controller: { mode: 'open-loop' },
      inputs: [{ channel: 'torque', shape: 'step', amplitude: 0.1 }],
      nonlinear: { coulombFriction: 0.3, staticFriction: 0.5 },
    });
    const result = superpositionCheck(stuck);
    expect(result.pass).toBe(false);
    expect(result.reason).toBe('static friction (breakaway 0.5 N·m) holding the joint at t = 0.000 s in the u1 run: no run moved the joint although torque acted');
  });

  it('blames a gravity load that acts without any input', () => {
    const result = superpositionCheck({ ...pid, nonlinear: { gravity: { mass: 0.2, arm: 0.1, offset: 0.3 } } });
    expect(result.pass).toBe(false);
    expect(result.reason).toMatch(/^gravity load m·g·l = 0.196133 N·m acting at t = 0.000 s/);
  });
});

describe('shift check', () => {
  it('passes for a continuous linear loop and for a sampled one shifted by whole periods', () => {
    expect(shiftCheck(pid, { shift: 0.3 }).pass).toBe(true);
    const aligned = shiftCheck(sampled, { shift: 0.3 });
    expect(aligned.pass).toBe(true);
    expect(aligned.worst).toBeLessThan(1e-8);
    expect(shiftCheck(sampled).pass).toBe(true);
  });

  it('fails for a sampled loop whose sample grid does not line up with the shift, and says so', () => {
    const result = shiftCheck(sampled, { shift: 0.305 });
    expect(result.pass).toBe(false);
    expect(result.dt).toBeCloseTo(0.305 / 305, 15);
    expect(result.reason).toMatch(/samples every 0.01 s and the shift 0.305 s is 30.5 sample periods, not a whole number/);
  });

  it('fails when the joint does not rest before the shifted input', () => {
    const result = shiftCheck({ ...pid, nonlinear: { gravity: { mass: 0.2, arm: 0.1, offset: 0.3 } } }, { shift: 0.5 });
    expect(result.pass).toBe(false);
    expect(result.reason).toMatch(/does not stay at rest before the shifted input: gravity load/);
  });

  it('refuses a shift outside (0, horizon)', () => {
    expect(() => shiftCheck(pid, { shift: 0 })).toThrow(/between 0 and the horizon/);
    expect(() => shiftCheck(pid, { shift: 5 })).toThrow(RangeError);
  });
});

describe('linear range', () => {
  it('reports the whole tried range for a linear scenario', () => {
    const result = linearRange(pid);
    expect(result).toMatchObject({ scale: 1000, smallestScale: null, passesAtMax: true, checks: 2 });
  });

  it('finds where a torque limit starts to bite', () => {
    // PD on measurement, step A·s: the drive asks kp·A·s at t = 0+ and less afterwards, so the
    // 2·u1 run reaches the 2 N·m limit from s* = 2 / (kp·2·A) = 0.25 (Newton, common practice).
    const s = buildScenario({ nonlinear: { torqueLimit: 2 } });
    const result = linearRange(s);
    expect(result.passesAtMax).toBe(false);
    expect(result.scale).not.toBeNull();
    expect(result.scale!).toBeGreaterThan(0.25 * 0.99);
    expect(result.scale!).toBeLessThan(0.25 * 1.1);
    expect(result.bracket[1]! / result.bracket[0]!).toBeLessThanOrEqual(1.01);
    expect(result.failure?.reason).toMatch(/torque limit ±2 N·m reached at t = 0.000 s in the 2·u1 run/);
  });

  it('finds where small moves stop being linear under Coulomb friction', () => {
    const result = linearRange(buildScenario({ nonlinear: { coulombFriction: 0.05 } }));
    expect(result.passesAtMax).toBe(true);
    expect(result.smallestScale).toBeGreaterThan(1);
    expect(result.smallestScale).toBeLessThan(1000);
    expect(result.failure?.reason).toMatch(/Coulomb friction 0.05 N·m sliding/);
  });

  it('refuses an empty scale range', () => {
    expect(() => linearRange(pid, { minScale: 2, maxScale: 1 })).toThrow(/minScale < maxScale/);
  });
});
