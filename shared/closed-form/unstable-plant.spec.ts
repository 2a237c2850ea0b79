import { describe, expect, it } from 'vitest';
import { frequencyResponseOf } from '../frequency/frequency-response';
import { parseScenario } from '../scenario/parse-scenario';
import { simulateTwin } from '../twin/twin-run';
import { makeScenario, solved } from './testing/make-scenario';

// An inverted pendulum about upright: J θ″ = m·g·l·θ for small θ, i.e. a stiffness of −m·g·l
// and open-loop poles ±√(m·g·l / J) (the linearized inverted pendulum; common practice).
const mgl = 2.5;
const J = 0.1;
const upright = { inertia: J, damping: 0, stiffness: -mgl };

describe('unstable plants: negative stiffness and damping', () => {
  it('are accepted within their range and refused past it, naming the field', () => {
    expect(parseScenario({ kind: 'kinetwin/scenario', version: 1, name: 'x', joint: { inertia: 1, damping: -0.1, stiffness: -3 }, controller: { mode: 'open-loop' }, horizon: 1 }).ok).toBe(true);
    const far = parseScenario({ kind: 'kinetwin/scenario', version: 1, name: 'x', joint: { inertia: 1, damping: 0, stiffness: -1e13 }, controller: { mode: 'open-loop' }, horizon: 1 });
    expect(far.ok === false && far.errors[0]!.field).toBe('joint.stiffness');
  });

  it('open loop: poles ±√(mgl/J), unstable, the final value theorem refused with its reason, and the caution in the notes', () => {
    const s = solved({ joint: upright, inputs: [{ channel: 'torque', shape: 'step', amplitude: 0.1 }] });
    const p = Math.sqrt(mgl / J);
    expect(s.poles.map((x) => x.re).sort((a, b) => a - b)).toEqual([expect.closeTo(-p, 10), expect.closeTo(p, 10)]);
    expect(s.stability).toBe('unstable');
    expect(s.finalValue.applies).toBe(false);
    expect(s.finalValue.reason).toMatch(/right half-plane|unstable/);
    expect(s.notes.some((n) => n.startsWith('negative stiffness (k = -2.5 N·m/rad)'))).toBe(true);
  });

  it('the twin of the open loop runs away and stops at its bound with the message', () => {
    const scenario = makeScenario({ joint: upright, initial: { angle: 0.01, velocity: 0 }, horizon: 60 });
    const run = simulateTwin(scenario, { dt: 0.01 });
    expect(run.stop?.message).toMatch(/angle left ±.* rad at t = .*the scenario runs away/);
    expect(run.samples.angle.every(Number.isFinite)).toBe(true);
  });

  it('a PD loop with N·kp > mgl holds it: stable poles, the final value theorem applies, twin and closed form agree', () => {
    const scenario = makeScenario({
      joint: upright,
      controller: { mode: 'pid', kp: 8, kd: 1.2, derivativeOn: 'measurement' },
      inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.05 }],
      horizon: 5,
    });
    const s = solved(scenario);
    expect(s.stability).toBe('stable');
    // Θ/R(0) = kp/(kp − mgl): the loop must out-stiffen the load (final value theorem).
    expect(s.finalValue.applies).toBe(true);
    expect(s.finalValue.value).toBeCloseTo((0.05 * 8) / (8 - mgl), 10);
    const twin = simulateTwin(scenario, { dt: 0.001 });
    expect(twin.stop).toBeNull();
    const final = twin.samples.angle.at(-1)!;
    expect(final).toBeCloseTo(s.finalValue.value!, 6);
  });

  it('frequency response: the caution in the notes, stable by the poles and by the Nyquist count with one open-loop pole on the right (P = 1)', () => {
    const loop = { mode: 'pid' as const, kp: 8, kd: 1.2 };
    const grid = { from: 0.1, to: 1000, points: 50 };
    const continuous = frequencyResponseOf(makeScenario({ joint: upright, controller: loop }), grid);
    const sampled = frequencyResponseOf(makeScenario({ joint: upright, controller: { ...loop, samplePeriod: 1e-5 } }), grid);
    if (!continuous.ok || !sampled.ok) throw new Error('refused');
    expect(continuous.value.stability).toBe('stable');
    expect(sampled.value.stability).toBe('stable');
    for (const r of [continuous.value, sampled.value]) {
      expect(r.notes.some((n) => /the open-loop plant is unstable \(1 pole in the right half-plane\)/.test(n))).toBe(true);
      expect(r.notes.some((n) => n.startsWith('negative stiffness'))).toBe(true);
    }
    // Too little gain (N·kp < mgl): unstable, by both routes.
    const weak = { mode: 'pid' as const, kp: 2, kd: 1.2 };
    const a = frequencyResponseOf(makeScenario({ joint: upright, controller: weak }), grid);
    const b = frequencyResponseOf(makeScenario({ joint: upright, controller: { ...weak, samplePeriod: 1e-5 } }), grid);
    expect(a.ok && a.value.stability).toBe('unstable');
    expect(b.ok && b.value.stability).toBe('unstable');
  });
});
