import { describe, expect, it } from 'vitest';
import type { InputTerm } from '../scenario/scenario-schema';
import { buildScenario } from './testing/build-scenario';
import { forcingTermsOf } from './forcing-terms';

const EPS = 1e-12;

function termsOf(inputs: InputTerm[], horizon = 2) {
  return forcingTermsOf(buildScenario({ controller: { mode: 'pid', kp: 1, ki: 0, kd: 0 }, inputs, horizon }));
}

describe('forcing terms', () => {
  it('lists each edge once, in order, from 0 to before the horizon', () => {
    const terms = termsOf([
      { channel: 'reference', shape: 'step', amplitude: 1, delay: 0.5 },
      { channel: 'torque', shape: 'pulse', amplitude: 2, delay: 0.5, width: 0.25 },
      { channel: 'torque', shape: 'step', amplitude: 1, delay: 3 },
    ]);
    expect(terms.breakpoints).toEqual([0, 0.5, 0.75]);
  });

  it('keeps the value from before an edge up to the end of the stretch that the edge closes', () => {
    // The integrator evaluates the right-hand side at the end of its last step; there the stretch
    // must still be the one before the step, or the step's jump leaks into the stretch before it.
    const terms = termsOf([{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 }]);
    expect(terms.stretchFrom(0, EPS).reference(0.1)).toBe(0);
    expect(terms.stretchFrom(0.1, EPS).reference(0.1)).toBe(0.5);
    expect(terms.stretchFrom(0.1 - 1e-13, EPS).reference(0.2)).toBe(0.5);
  });

  it('acts a pulse from its start up to its end only', () => {
    const terms = termsOf([{ channel: 'torque', shape: 'pulse', amplitude: 2, delay: 0.5, width: 0.25 }]);
    expect(terms.stretchFrom(0, EPS).torque(0.5)).toBe(0);
    expect(terms.stretchFrom(0.5, EPS).torque(0.75)).toBe(2);
    expect(terms.stretchFrom(0.75, EPS).torque(0.8)).toBe(0);
    expect(terms.stretchFrom(0.5, EPS).torqueConstant).toBe(true);
  });

  it('evaluates the smooth shapes from their own start (definitions of the shapes, common practice)', () => {
    const terms = termsOf([
      { channel: 'reference', shape: 'ramp', amplitude: 2, delay: 0.2 },
      { channel: 'reference', shape: 'sine', amplitude: 0.5, delay: 0.2, frequency: 3 },
      { channel: 'torque', shape: 'decay', amplitude: 1.5, delay: 0.1, rate: 4 },
      { channel: 'torque', shape: 'cosine', amplitude: 0.3, delay: 0.1, frequency: 5 },
    ]);
    const stretch = terms.stretchFrom(0.2, EPS);
    const s = 0.7 - 0.2;
    expect(stretch.reference(0.7)).toBeCloseTo(2 * s + 0.5 * Math.sin(3 * s), 14);
    expect(stretch.referenceRate(0.7)).toBeCloseTo(2 + 0.5 * 3 * Math.cos(3 * s), 13);
    expect(stretch.torque(0.7)).toBeCloseTo(1.5 * Math.exp(-4 * 0.6) + 0.3 * Math.cos(5 * 0.6), 14);
    expect(stretch.torqueConstant).toBe(false);
  });

  it('gives r″ of every smooth reference shape, the derivative of its rate', () => {
    const terms = termsOf([
      { channel: 'reference', shape: 'ramp', amplitude: 2, delay: 0.2 },
      { channel: 'reference', shape: 'sine', amplitude: 0.5, delay: 0.2, frequency: 3 },
      { channel: 'reference', shape: 'cosine', amplitude: 0.3, delay: 0.1, frequency: 5 },
      { channel: 'reference', shape: 'decay', amplitude: 1.5, delay: 0.1, rate: 4 },
      { channel: 'reference', shape: 'step', amplitude: 1, delay: 0.1 },
    ]);
    const stretch = terms.stretchFrom(0.2, EPS);
    const exact = -0.5 * 9 * Math.sin(3 * 0.5) - 0.3 * 25 * Math.cos(5 * 0.6) + 1.5 * 16 * Math.exp(-4 * 0.6);
    expect(stretch.referenceAcceleration(0.7)).toBeCloseTo(exact, 12);
    // Central difference of the rate (common practice): error O(h²).
    const h = 1e-5;
    expect(stretch.referenceAcceleration(0.7)).toBeCloseTo((stretch.referenceRate(0.7 + h) - stretch.referenceRate(0.7 - h)) / (2 * h), 5);
    expect(termsOf([{ channel: 'reference', shape: 'step', amplitude: 1, delay: 0 }]).stretchFrom(0, EPS).referenceAcceleration(0.5)).toBe(0);
  });

  it('reports the jumps at an edge: reference steps and pulse edges, torque impulses', () => {
    const terms = termsOf([
      { channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 },
      { channel: 'reference', shape: 'pulse', amplitude: 0.2, delay: 0.1, width: 0.4 },
      { channel: 'torque', shape: 'impulse', amplitude: 0.03, delay: 0.5 },
    ]);
    expect(terms.referenceJumpAt(0.1)).toBeCloseTo(0.7, 15);
    expect(terms.referenceJumpAt(0.5)).toBeCloseTo(-0.2, 15);
    expect(terms.torqueImpulseAt(0.5)).toBe(0.03);
    expect(terms.torqueImpulseAt(0.1)).toBe(0);
    // An impulse has no value between edges: it acts only as the jump.
    expect(terms.stretchFrom(0.5, EPS).torque(0.6)).toBe(0);
  });
});
