import { type Scenario } from '../../scenario/scenario-schema';
import { addComplex, divideComplex, multiplyComplex, type Complex } from '../complex-number';

/** One undelayed transform and the time it starts, for "invert each undelayed term and shift". */
export interface DelayedTransform {
  delay: number;
  angle: (s: Complex) => Complex;
  velocity: (s: Complex) => Complex;
}

const c = (re: number, im = 0): Complex => ({ re, im });
const mul = multiplyComplex;
const add = addComplex;
const div = divideComplex;

/**
 * Θ(s) of a scenario written straight from the joint model with complex arithmetic — no
 * polynomials, no partial fractions — so the tests check the engine against an independent
 * derivation: (G + N·C)Θ = N·C_r·R + T + J(sθ0 + v0) + bθ0 + N·kd·F·θ0, with
 * G = Js² + bs + k, C = kp + ki/s + kd·s·F, C_r = kp + ki/s + δ·kd·s·F, F = 1/(Tf·s + 1).
 */
export function scenarioTransforms(sc: Scenario): DelayedTransform[] {
  const { inertia: J, damping: b, stiffness: k, gearRatio: N } = sc.joint;
  const ctl = sc.controller;
  const pid = ctl.mode === 'pid';
  const G = (s: Complex) => add(add(mul(c(J), mul(s, s)), mul(c(b), s)), c(k));
  const F = (s: Complex) => div(c(1), add(mul(c(ctl.derivativeFilter), s), c(1)));
  const C = (s: Complex, deltaD: number) =>
    pid ? add(add(c(ctl.kp), div(c(ctl.ki), s)), mul(c(deltaD * ctl.kd), mul(s, F(s)))) : c(0);
  const delta = ctl.derivativeOn === 'error' ? 1 : 0;
  const loop = (s: Complex) => add(G(s), mul(c(N), C(s, 1)));
  const out: DelayedTransform[] = [];
  const { angle: th0, velocity: v0 } = sc.initial;
  const free = (s: Complex) => {
    let n = add(mul(c(J), add(mul(s, c(th0)), c(v0))), c(b * th0));
    if (pid) n = add(n, mul(c(N * ctl.kd * th0), F(s)));
    return div(n, loop(s));
  };
  out.push({ delay: 0, angle: free, velocity: (s) => add(mul(s, free(s)), c(-th0)) });
  sc.inputs.forEach((term) => {
    const A = term.amplitude;
    const w = term.frequency ?? 0;
    const shapes: { delay: number; X: (s: Complex) => Complex }[] = [];
    switch (term.shape) {
      case 'impulse':
        shapes.push({ delay: term.delay, X: () => c(A) });
        break;
      case 'step':
        shapes.push({ delay: term.delay, X: (s) => div(c(A), s) });
        break;
      case 'ramp':
        shapes.push({ delay: term.delay, X: (s) => div(c(A), mul(s, s)) });
        break;
      case 'pulse':
        shapes.push({ delay: term.delay, X: (s) => div(c(A), s) }, { delay: term.delay + (term.width ?? 0), X: (s) => div(c(-A), s) });
        break;
      case 'sine':
        shapes.push({ delay: term.delay, X: (s) => div(c(A * w), add(mul(s, s), c(w * w))) });
        break;
      case 'cosine':
        shapes.push({ delay: term.delay, X: (s) => div(mul(c(A), s), add(mul(s, s), c(w * w))) });
        break;
      case 'decay':
        shapes.push({ delay: term.delay, X: (s) => div(c(A), add(s, c(term.rate ?? 0))) });
        break;
    }
    for (const { delay, X } of shapes) {
      const H = (s: Complex) => (term.channel === 'reference' ? div(mul(c(N), C(s, delta)), loop(s)) : div(c(1), loop(s)));
      const angle = (s: Complex) => mul(H(s), X(s));
      out.push({ delay, angle, velocity: (s) => mul(s, angle(s)) });
    }
  });
  return out;
}
