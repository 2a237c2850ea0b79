import { describe, expect, it } from 'vitest';
import { addComplex, multiplyComplex, subtractComplex, type Complex } from './complex-number';
import { channelTransferFunctions, jointTransfer } from './joint-transfer';
import { evaluateRationalComplex } from './rational-function';
import { makeScenario } from './testing/make-scenario';

describe('jointTransfer', () => {
  it('gives the open-loop joint J s² + b s + k', () => {
    const t = jointTransfer(makeScenario({ joint: { inertia: 2, damping: 3, stiffness: 5 } }));
    expect(t.characteristic).toEqual([5, 3, 2]);
    expect(t.angleFromTorque).toEqual([1]);
  });

  it('gives the PID characteristic polynomial and drops the origin without integral action', () => {
    const withI = jointTransfer(makeScenario({ joint: { inertia: 1, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kp: 12, ki: 8, kd: 6 } }));
    expect(withI.characteristic).toEqual([8, 12, 6, 1]); // (s + 2)³
    const noI = jointTransfer(makeScenario({ joint: { inertia: 1, damping: 1, stiffness: 0 }, controller: { mode: 'pid', kp: 4, kd: 1 } }));
    expect(noI.characteristic).toEqual([4, 2, 1]);
  });

  it('leaves the derivative filter out when kd is zero', () => {
    const t = jointTransfer(makeScenario({ controller: { mode: 'pid', kp: 1, ki: 1, derivativeFilter: 0.1 } }));
    expect(t.filtered).toBe(false);
    expect(t.characteristic).toHaveLength(4);
  });

  it('satisfies the joint equation channel by channel: G·Θ = U + T (controller torque at the joint)', () => {
    // Check at complex points: (J s² + b s + k)Θ(s) = U(s) + T(s), per unit input on each channel.
    const sc = makeScenario({
      joint: { inertia: 0.3, damping: 0.2, stiffness: 1.5, gearRatio: 4 },
      controller: { mode: 'pid', kp: 3, ki: 2, kd: 0.4, derivativeFilter: 0.05, derivativeOn: 'measurement' },
    });
    const ch = channelTransferFunctions(jointTransfer(sc));
    const G = (s: Complex) => addComplex(addComplex(multiplyComplex({ re: 0.3, im: 0 }, multiplyComplex(s, s)), multiplyComplex({ re: 0.2, im: 0 }, s)), { re: 1.5, im: 0 });
    for (const s of [{ re: 0.3, im: 1.1 }, { re: -2, im: 0.5 }, { re: 4, im: -3 }]) {
      const ref = subtractComplex(multiplyComplex(G(s), evaluateRationalComplex(ch.reference.angle, s)), evaluateRationalComplex(ch.reference.controllerTorque, s));
      expect(Math.hypot(ref.re, ref.im)).toBeLessThan(1e-12);
      const tor = subtractComplex(multiplyComplex(G(s), evaluateRationalComplex(ch.torque.angle, s)), evaluateRationalComplex(ch.torque.controllerTorque, s));
      expect(Math.hypot(tor.re - 1, tor.im)).toBeLessThan(1e-12);
      const vel = subtractComplex(evaluateRationalComplex(ch.torque.velocity, s), multiplyComplex(s, evaluateRationalComplex(ch.torque.angle, s)));
      expect(Math.hypot(vel.re, vel.im)).toBeLessThan(1e-12);
    }
  });
});
