import { describe, expect, it } from 'vitest';
import { chooseSlip, frictionEvent } from './friction-regime';

const staticFriction = 0.05;

describe('the friction regime', () => {
  it('breaks away only where the net torque exceeds the static friction, in its direction', () => {
    expect(chooseSlip(0, 0.05, staticFriction)).toBe(0);
    expect(chooseSlip(0, -0.0501, staticFriction)).toBe(-1);
    expect(chooseSlip(0, 0.2, staticFriction)).toBe(1);
  });

  it('slides with a moving joint whatever the net torque', () => {
    expect(chooseSlip(-1e-12, 10, staticFriction)).toBe(-1);
    expect(chooseSlip(0.3, 0, staticFriction)).toBe(1);
  });

  it('ends a slide when the velocity leaves its direction, and a hold when the net torque passes τs', () => {
    expect(frictionEvent(1, 0.1, 99, staticFriction)).toBeLessThan(0);
    expect(frictionEvent(1, -1e-9, 99, staticFriction)).toBeGreaterThan(0);
    expect(frictionEvent(-1, 1e-9, 0, staticFriction)).toBeGreaterThan(0);
    expect(frictionEvent(0, 0, 0.04, staticFriction)).toBeLessThan(0);
    expect(frictionEvent(0, 0, -0.06, staticFriction)).toBeGreaterThan(0);
  });

  it('never picks a regime its own event function ends at once', () => {
    for (const [v, net] of [[0, 0.03], [0, -0.08], [0.2, -1], [-0.2, 1], [0, 0.05]] as const) {
      expect(frictionEvent(chooseSlip(v, net, staticFriction), v, net, staticFriction)).toBeLessThanOrEqual(0);
    }
  });
});
