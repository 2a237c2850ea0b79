import { describe, expect, it } from 'vitest';
import { driveTorque, gravityTorque, quantizeAngle } from './joint-effects';

describe('static joint effects', () => {
  it('clamps, then removes the dead band, symmetrically', () => {
    expect(driveTorque(5, 2, 0.5)).toBe(1.5);
    expect(driveTorque(-5, 2, 0.5)).toBe(-1.5);
    expect(driveTorque(0.4, 2, 0.5)).toBe(0);
    expect(driveTorque(-0.7, Infinity, 0)).toBe(-0.7);
  });

  // Pendulum load torque −m·g·l·sin(θ + offset) (common practice).
  it('pulls the centre of mass down: zero hanging, −m·g·l horizontal', () => {
    expect(gravityTorque(0, 3, 0) === 0).toBe(true);
    expect(gravityTorque(0, 3, Math.PI / 2)).toBe(-3);
    expect(gravityTorque(-Math.PI / 2, 3, Math.PI / 2) === 0).toBe(true);
  });

  it('rounds to the nearest encoder count', () => {
    const count = (2 * Math.PI) / 360;
    expect(quantizeAngle(0.4 * count, 360)).toBe(0);
    expect(quantizeAngle(0.6 * count, 360)).toBe(count);
    expect(quantizeAngle(-1.6 * count, 360)).toBeCloseTo(-2 * count, 15);
    expect(quantizeAngle(0.123, 0)).toBe(0.123);
  });
});
