import { describe, expect, it } from 'vitest';
import { evaluateClosedForm, gridPointCount } from './evaluate-closed-form';
import { compileResponsePlan, evaluateUniformGrid, responseAt } from './response-evaluator';
import { solved } from './testing/make-scenario';

describe('response evaluator', () => {
  const s = solved({
    joint: { inertia: 0.2, damping: 0.05, stiffness: 0 },
    controller: { mode: 'pid', kp: 8, ki: 4, kd: 1, derivativeFilter: 0.02 },
    initial: { angle: 0.05, velocity: 0 },
    inputs: [
      { channel: 'reference', shape: 'step', amplitude: 1 },
      { channel: 'torque', shape: 'step', amplitude: -0.5, delay: 0.5 },
      { channel: 'reference', shape: 'sine', amplitude: 0.1, frequency: 5, delay: 1.25 },
      { channel: 'torque', shape: 'pulse', amplitude: 0.3, delay: 2, width: 0.1 },
    ],
    horizon: 60,
  });

  it('matches the exact point evaluation on a long grid (recurrence re-anchored)', () => {
    const n = 60001;
    const angle = new Float64Array(n);
    const velocity = new Float64Array(n);
    evaluateUniformGrid(s.plan, 0.001, n, angle, velocity);
    for (let i = 0; i < n; i += 997) {
      expect(angle[i]).toBeCloseTo(responseAt(s.plan, i * 0.001, 0), 12);
      expect(velocity[i]).toBeCloseTo(responseAt(s.plan, i * 0.001, 1), 11);
    }
    expect(angle.every(Number.isFinite) && velocity.every(Number.isFinite)).toBe(true);
  });

  it('treats a term starting exactly on a grid time as active there (right limit)', () => {
    const step = solved({ joint: { inertia: 1, damping: 1, stiffness: 1 }, inputs: [{ channel: 'torque', shape: 'impulse', amplitude: 2, delay: 0.3 }] });
    const sampled = evaluateClosedForm(step, 0.1, 1);
    if (!sampled.ok) throw new Error('refused');
    const r = sampled.value;
    expect(r.velocity[2]).toBe(0);
    expect(r.velocity[3]).toBeCloseTo(2, 12); // Δθ′ = A/J at the impulse (impulse–momentum, common practice)
  });

  it('samples 0 … horizon inclusive and allocates the arrays once', () => {
    expect(gridPointCount(2, 0.001)).toBe(2001);
    expect(gridPointCount(0.3, 0.1)).toBe(4);
    const r = evaluateClosedForm(s, 0.01, 1);
    expect(r.ok && r.value.t.length).toBe(101);
    expect(r.ok && r.value.t[100]).toBeCloseTo(1, 14);
  });

  it('refuses a bad grid, naming the field', () => {
    expect(evaluateClosedForm(s, 0, 1)).toMatchObject({ ok: false, errors: [{ field: 'dt' }] });
    expect(evaluateClosedForm(s, Number.NaN, 1)).toMatchObject({ ok: false, errors: [{ field: 'dt' }] });
    expect(evaluateClosedForm(s, 0.1, Number.POSITIVE_INFINITY)).toMatchObject({ ok: false, errors: [{ field: 'horizon' }] });
    expect(evaluateClosedForm(s, 1e-9, 60)).toMatchObject({ ok: false, errors: [{ field: 'dt' }] });
  });

  it('gives zeros for a joint at rest with no inputs', () => {
    const rest = solved({});
    const angle = new Float64Array(5).fill(7);
    const velocity = new Float64Array(5).fill(7);
    evaluateUniformGrid(rest.plan, 0.1, 5, angle, velocity);
    expect([...angle, ...velocity]).toEqual(Array(10).fill(0));
    expect(compileResponsePlan([]).segmentStart.length).toBe(0);
  });
});
