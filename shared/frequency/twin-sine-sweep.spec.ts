import { describe, expect, it } from 'vitest';
import { makeScenario } from '../closed-form/testing/make-scenario';
import { frequencyResponseOf } from './frequency-response';
import { sineSweepOfTwin } from './twin-sine-sweep';

const db = (x: number) => 20 * Math.log10(x);

/** Closed-form magnitude (dB) and phase (°) of a path at one frequency. */
function closedForm(scenario: ReturnType<typeof makeScenario>, path: 'referenceToAngle' | 'torqueToAngle', w: number) {
  const r = frequencyResponseOf(scenario, { from: w, to: w * (1 + 1e-9), points: 2 });
  if (!r.ok) throw new Error('closed form refused');
  const s = r.value[path]!;
  return { magnitudeDb: s.magnitudeDb[0]!, phaseDeg: s.phaseDeg[0]! };
}

describe("the twin's measured frequency response", () => {
  it('matches the closed form within 1e-3 of magnitude where every effect is off (reference and torque paths of a PID loop)', () => {
    const scenario = makeScenario({
      joint: { inertia: 0.05, damping: 0.4, stiffness: 0 },
      controller: { mode: 'pid', kp: 8, ki: 4, kd: 0.6, derivativeFilter: 0.01 },
    });
    const frequencies = [0.5, 3, 12, 40, 150];
    for (const channel of ['reference', 'torque'] as const) {
      const r = sineSweepOfTwin(scenario, { frequencies, channel, amplitude: 0.2 });
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      r.value.points.forEach((p, i) => {
        const cf = closedForm(scenario, channel === 'reference' ? 'referenceToAngle' : 'torqueToAngle', frequencies[i]!);
        expect(p.reason).toBeNull();
        // 1e-3 relative in magnitude is 0.0087 dB.
        expect(Math.abs(10 ** ((p.magnitudeDb! - cf.magnitudeDb) / 20) - 1)).toBeLessThan(1e-3);
        expect(p.phaseDeg! - cf.phaseDeg).toBeCloseTo(0, 1);
        expect(p.distortion!).toBeLessThan(1e-4);
        expect(p.saturated).toBe(false);
      });
    }
  });

  it('a torque limit lowers the fundamental by the describing function of saturation, (2/π)(asin(1/a) + √(1 − 1/a²)/a) at a = A/L (Gelb & Vander Velde, Multiple-Input Describing Functions, 1968, from memory)', () => {
    // Open loop: the limit clips the injected torque itself, and the plant after it is linear,
    // so the angle's fundamental is the plant's response to the clipped torque's fundamental.
    const limit = 1;
    const scenario = makeScenario({ joint: { inertia: 1, damping: 2, stiffness: 5 }, nonlinear: { torqueLimit: limit } });
    const w = 2;
    for (const amplitude of [0.5, 2, 5]) {
      const r = sineSweepOfTwin(scenario, { frequencies: [w], channel: 'torque', amplitude });
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      const [p] = r.value.points;
      const a = amplitude / limit;
      const N = a <= 1 ? 1 : (2 / Math.PI) * (Math.asin(1 / a) + Math.sqrt(1 - 1 / a ** 2) / a);
      const cf = closedForm(scenario, 'torqueToAngle', w);
      expect(p!.magnitudeDb! - (cf.magnitudeDb + db(N))).toBeCloseTo(0, 4);
      expect(p!.phaseDeg! - cf.phaseDeg).toBeCloseTo(0, 2);
      expect(p!.saturated).toBe(amplitude > limit);
      if (amplitude > limit) expect(p!.distortion!).toBeGreaterThan(1e-3);
    }
  });

  it('removes the drift of a free joint (two poles at the origin) and measures 1/(J ω²) with a lag of 180°', () => {
    const scenario = makeScenario({ joint: { inertia: 0.5, damping: 0, stiffness: 0 } });
    const r = sineSweepOfTwin(scenario, { frequencies: [4], channel: 'torque', amplitude: 1 });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.value.points[0]!.magnitudeDb).toBeCloseTo(db(1 / (0.5 * 16)), 4);
    expect(r.value.points[0]!.phaseDeg).toBeCloseTo(-180, 2);
  });

  it('refuses what it cannot measure, naming why', () => {
    const unstable = makeScenario({ joint: { inertia: 1, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kp: 1, ki: 10 } });
    const u = sineSweepOfTwin(unstable, { frequencies: [1], channel: 'reference', amplitude: 1 });
    expect(u.ok === false && u.errors[0]!.message).toMatch(/unstable/);
    const undamped = makeScenario({ joint: { inertia: 1, damping: 0, stiffness: 4 } });
    const a = sineSweepOfTwin(undamped, { frequencies: [1], channel: 'torque', amplitude: 1 });
    expect(a.ok === false && a.errors[0]!.message).toMatch(/never settles/);
    const open = makeScenario({});
    const bad = sineSweepOfTwin(open, { frequencies: [], channel: 'reference', amplitude: -1 });
    expect(bad.ok === false && bad.errors.map((e) => e.field)).toEqual(['frequencies', 'amplitude', 'channel']);
    // A transient slower than a run may last: that frequency has no figure, and says why.
    const slow = makeScenario({ joint: { inertia: 1, damping: 0.001, stiffness: 1 } });
    const s = sineSweepOfTwin(slow, { frequencies: [1.5], channel: 'torque', amplitude: 1 });
    expect(s.ok && s.value.points[0]!.reason).toMatch(/transient needs .* s to die out/);
  });
});
