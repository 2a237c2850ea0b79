import { describe, expect, it } from 'vitest';
import { buildScenario } from './testing/build-scenario';
import { simulateTwin } from './twin-run';

type Matrix = number[][];
const multiply = (a: Matrix, b: Matrix): Matrix => a.map((row) => b[0]!.map((_, j) => row.reduce((s, v, k) => s + v * b[k]![j]!, 0)));
const add = (a: Matrix, b: Matrix): Matrix => a.map((row, i) => row.map((v, j) => v + b[i]![j]!));
const scale = (a: Matrix, c: number): Matrix => a.map((row) => row.map((v) => v * c));
const identity = (n: number): Matrix => Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));

/** e^M by scaling and squaring with a Taylor series (Moler & Van Loan, "Nineteen dubious ways", SIAM Review 2003, from memory). */
function expm(m: Matrix): Matrix {
  const norm = Math.max(...m.map((row) => row.reduce((s, v) => s + Math.abs(v), 0)));
  const squarings = Math.max(0, Math.ceil(Math.log2(norm)) + 4);
  const a = scale(m, 2 ** -squarings);
  let term = identity(m.length);
  let sum = identity(m.length);
  for (let k = 1; k <= 20; k++) {
    term = scale(multiply(term, a), 1 / k);
    sum = add(sum, term);
  }
  for (let i = 0; i < squarings; i++) sum = multiply(sum, sum);
  return sum;
}

describe('sampled PD loop against the exact zero-order-hold discretization', () => {
  it('matches x[k+1] = Φ·x[k] + Γ·u[k] sample by sample', () => {
    // Franklin, Powell & Workman, Digital Control of Dynamic Systems (3rd ed.), §4.3: with u held
    // over each period T, Φ = e^(A·T) and Γ = ∫₀ᵀ e^(A·σ) dσ·B, both read off e^([[A, B], [0, 0]]·T)
    // (Van Loan 1978, from memory). The controller is the twin's documented law: PD on the
    // measured angle with the backward difference (θ_k − θ_{k−1})/T.
    const J = 0.05;
    const b = 0.02;
    const k = 0.3;
    const n = 1.5;
    const kp = 6;
    const kd = 0.25;
    const T = 0.01;
    const r = 0.5;
    const s = buildScenario({
      joint: { inertia: J, damping: b, stiffness: k, gearRatio: n },
      controller: { mode: 'pid', kp, kd, derivativeOn: 'measurement', samplePeriod: T },
      inputs: [{ channel: 'reference', shape: 'step', amplitude: r }],
      initial: { angle: 0.1, velocity: -0.2 },
      horizon: 1.5,
    });
    const { samples, stop } = simulateTwin(s, { dt: T });
    expect(stop).toBeNull();

    const augmented = expm(scale([[0, 1, 0], [-k / J, -b / J, 1 / J], [0, 0, 0]], T));
    const phi = [augmented[0]!.slice(0, 2), augmented[1]!.slice(0, 2)];
    const gamma = [augmented[0]![2]!, augmented[1]![2]!];
    let x = [0.1, -0.2];
    let previous = x[0]!;
    let worst = 0;
    for (let i = 0; i < samples.t.length; i++) {
      worst = Math.max(worst, Math.abs(samples.angle[i]! - x[0]!), Math.abs(samples.velocity[i]! - x[1]!) * T);
      const u = n * (kp * (r - x[0]!) + kd * (-x[0]! + previous) / T);
      expect(samples.controllerTorque[i]).toBeCloseTo(u, 7);
      previous = x[0]!;
      x = [phi[0]![0]! * x[0]! + phi[0]![1]! * x[1]! + gamma[0]! * u, phi[1]![0]! * x[0]! + phi[1]![1]! * x[1]! + gamma[1]! * u];
    }
    expect(samples.t.length).toBe(151);
    expect(worst).toBeLessThan(1e-9);
  });

  it('holds the torque constant between samples on a finer output grid', () => {
    const s = buildScenario({ controller: { mode: 'pid', kp: 8, kd: 0.6, derivativeOn: 'error', samplePeriod: 0.005 }, horizon: 0.2 });
    const { samples } = simulateTwin(s, { dt: 0.001 });
    for (let i = 0; i < samples.t.length; i++) {
      const held = Math.floor(i / 5) * 5;
      expect(samples.controllerTorque[i]).toBe(samples.controllerTorque[held]);
    }
    // The discrete derivative kick: kd·r/T for the first sample on derivative on error.
    expect(samples.controllerTorque[0]).toBeCloseTo(8 * 0.5 + (0.6 * 0.5) / 0.005, 9);
  });
});
