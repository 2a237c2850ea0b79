import { abs, add, arg, complex as mComplex, divide, multiply, type Complex as MComplex } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { makeScenario } from '../closed-form/testing/make-scenario';
import { type ScenarioInput } from '../scenario/scenario-schema';
import { frequencyResponseOf, type FrequencyResponse } from './frequency-response';
import { logFrequencies } from './frequency-grid';

const DEG = 180 / Math.PI;
const db = (x: number) => 20 * Math.log10(x);

function response(patch: Partial<ScenarioInput>, grid = { from: 0.01, to: 1000, points: 400 }): FrequencyResponse {
  const r = frequencyResponseOf(makeScenario(patch), grid);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** The value of a series at one frequency of the grid (the grid is asked to contain it). */
function at(r: FrequencyResponse, series: (number | null)[], w: number): number {
  const i = r.frequency.findIndex((f) => Math.abs(f / w - 1) < 1e-12);
  if (i < 0) throw new Error(`grid has no ${w}`);
  return series[i]!;
}

describe('frequency response of the joint plant (open loop)', () => {
  it('a first-order lag: −3.01 dB and −45° at its corner, on top of the integrator (Ogata, Modern Control Engineering, §7-2, from memory)', () => {
    // Θ/T = 1/(s(J s + b)): the integrator gives 1/ω and −90°, the lag 1/(τs + 1), τ = J/b.
    const J = 0.5;
    const b = 2;
    const corner = b / J;
    const r = response({ joint: { inertia: J, damping: b, stiffness: 0 } }, { from: corner / 100, to: corner * 100, points: 5 });
    expect(at(r, r.torqueToAngle.magnitudeDb, corner)).toBeCloseTo(db(1 / (corner * b)) - 10 * Math.log10(2), 10);
    expect(at(r, r.torqueToAngle.phaseDeg, corner)).toBeCloseTo(-135, 10);
    // Far below and far above the corner: −90° and −180° (not +180°: the phase is unwrapped).
    expect(r.torqueToAngle.phaseDeg[0]).toBeCloseTo(-90 - Math.atan(0.01) * DEG, 10);
    expect(r.torqueToAngle.phaseDeg.at(-1)).toBeCloseTo(-90 - Math.atan(100) * DEG, 10);
    expect(r.loop).toBeNull();
    expect(r.stability).toBe('no-loop');
    expect(r.margins).toEqual({ gainMarginDb: null, phaseCrossover: null, phaseMarginDeg: null, gainCrossover: null, bandwidth: null });
  });

  it('a second-order plant: 1/(2ζ k) and −90° at ωn, the resonant peak Mr = 1/(2ζ√(1−ζ²)) at ωn√(1−2ζ²) (Ogata, §7-2, from memory)', () => {
    const [J, k, zeta] = [0.02, 8, 0.1];
    const wn = Math.sqrt(k / J);
    const b = 2 * zeta * Math.sqrt(k * J);
    const r = response({ joint: { inertia: J, damping: b, stiffness: k } }, { from: wn / 10, to: wn * 10, points: 9001 });
    const i = r.frequency.findIndex((f) => Math.abs(f / wn - 1) < 1e-12);
    expect(r.torqueToAngle.magnitudeDb[i]).toBeCloseTo(db(1 / (2 * zeta * k)), 9);
    expect(r.torqueToAngle.phaseDeg[i]).toBeCloseTo(-90, 9);
    const peak = Math.max(...r.torqueToAngle.magnitudeDb.map((m) => m!));
    const wPeak = r.frequency[r.torqueToAngle.magnitudeDb.indexOf(peak)]!;
    expect(peak).toBeCloseTo(db(1 / k) + db(1 / (2 * zeta * Math.sqrt(1 - zeta ** 2))), 4);
    expect(wPeak / (wn * Math.sqrt(1 - 2 * zeta ** 2))).toBeCloseTo(1, 3);
    expect(r.torqueToAngle.phaseDeg.at(-1)).toBeLessThan(-178);
  });
});

describe('margins and bandwidth of the loop', () => {
  it.each([0.2, 0.4, 0.7, 1])(
    'loop ωn²/(s(s + 2ζωn)), ζ = %s: phase margin atan(2ζ/√(√(1+4ζ⁴) − 2ζ²)), its crossover and the closed-loop bandwidth (Nise, Control Systems Engineering, §10.10 and §10.8, from memory)',
    (zeta) => {
      // P control of a damped inertia: L = kp/(s(J s + b)); closed loop kp/(J s² + b s + kp).
      const wn = 12;
      const r = response({ joint: { inertia: 1, damping: 2 * zeta * wn, stiffness: 0 }, controller: { mode: 'pid', kp: wn * wn } });
      const root = Math.sqrt(Math.sqrt(1 + 4 * zeta ** 4) - 2 * zeta ** 2);
      expect(r.margins.phaseMarginDeg).toBeCloseTo(Math.atan((2 * zeta) / root) * DEG, 8);
      expect(r.margins.gainCrossover! / (wn * root)).toBeCloseTo(1, 10);
      const bandwidth = wn * Math.sqrt(1 - 2 * zeta ** 2 + Math.sqrt(4 * zeta ** 4 - 4 * zeta ** 2 + 2));
      expect(r.margins.bandwidth! / bandwidth).toBeCloseTo(1, 10);
      // The phase tends to −180° and never reaches it.
      expect(r.margins.gainMarginDb).toBeNull();
      expect(r.margins.phaseCrossover).toBeNull();
      expect(r.notes).toContain('no phase crossover: the loop phase never reaches −180°, so the gain margin is unbounded');
      expect(r.stability).toBe('stable');
      expect(r.notes[0]).toBe('stable loop');
    },
  );

  it.each([
    [2, 'stable'],
    [6, 'marginal'],
    [10, 'unstable'],
  ] as const)('loop K/(s(s + 1)(s + 2)), K = %s: phase crossover at √2 and gain margin 20·log10(6/K) (Routh–Hurwitz; common practice): %s', (K, stability) => {
    // Integral action alone on J = 1, b = 3, k = 2: L = N·ki/(s(s² + 3s + 2)).
    const r = response({ joint: { inertia: 1, damping: 3, stiffness: 2 }, controller: { mode: 'pid', ki: K } });
    expect(r.margins.phaseCrossover! / Math.SQRT2).toBeCloseTo(1, 10);
    expect(r.margins.gainMarginDb).toBeCloseTo(db(6 / K), 8);
    expect(r.stability).toBe(stability);
  });

  it('loop K·e^(−sτ)/s of a sampled derivative loop: crossover at K, PM = 90° − Kτ, phase crossover π/(2τ), GM = 20·log10(π/(2τK)) (solved by hand from |L(jω)| = 1; common practice)', () => {
    // kd alone on a free inertia: L = kd/(J s); sampled at T, the hold is e^(−sT/2), the compute delay e^(−sT).
    const K = 10;
    const T = 0.02;
    for (const computeDelay of [false, true]) {
      const tau = T / 2 + (computeDelay ? T : 0);
      const r = response({ joint: { inertia: 1, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kd: K, samplePeriod: T }, nonlinear: { computeDelay } });
      expect(r.margins.gainCrossover).toBeCloseTo(K, 9);
      expect(r.margins.phaseMarginDeg).toBeCloseTo(90 - K * tau * DEG, 8);
      expect(r.margins.phaseCrossover! / (Math.PI / (2 * tau))).toBeCloseTo(1, 10);
      expect(r.margins.gainMarginDb).toBeCloseTo(db(Math.PI / (2 * tau * K)), 8);
      expect(r.stability).toBe('stable');
      expect(r.delayModel).toMatch(/e\^\(−sT\/2\)/);
    }
    // Past Kτ = π/2 the delayed loop is unstable (Nyquist), though its margins, read modulo 360°, may look fine.
    const fast = response({ joint: { inertia: 1, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kd: 100, samplePeriod: 0.04 }, nonlinear: { computeDelay: true } });
    expect(fast.stability).toBe('unstable');
    expect(fast.margins.gainMarginDb).toBeLessThan(0);
  });

  it('a PD loop on a free inertia: closed-loop torque-to-angle tends to 1/kp at low frequency and the bandwidth of kp/(J s² + kd s + kp) (Nise, §10.8, from memory)', () => {
    const [J, kp, kd] = [0.05, 20, 1.2];
    const wn = Math.sqrt(kp / J);
    const zeta = kd / (2 * Math.sqrt(kp * J));
    const r = response({ joint: { inertia: J, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kp, kd, derivativeOn: 'measurement' } });
    expect(r.torqueToAngle.magnitudeDb[0]).toBeCloseTo(db(1 / kp), 4);
    expect(r.referenceToAngle!.magnitudeDb[0]).toBeCloseTo(0, 5);
    const bandwidth = wn * Math.sqrt(1 - 2 * zeta ** 2 + Math.sqrt(4 * zeta ** 4 - 4 * zeta ** 2 + 2));
    expect(r.margins.bandwidth! / bandwidth).toBeCloseTo(1, 10);
  });

  it('agrees with mathjs evaluating the loop C(s)·N/G(s) at jω (a general-purpose reference library), modulo whole turns of phase', () => {
    const c = { kp: 30, ki: 12, kd: 0.8, derivativeFilter: 0.004 };
    const joint = { inertia: 0.03, damping: 0.4, stiffness: 1.5, gearRatio: 3 };
    const r = response({ joint, controller: { mode: 'pid', ...c } });
    r.frequency.forEach((w, i) => {
      const sj = mComplex(0, w);
      const c2 = (x: unknown) => x as MComplex;
      const controller = c2(add(divide(add(multiply(sj, c.kp), c.ki), sj), divide(multiply(sj, c.kd), add(multiply(sj, c.derivativeFilter), 1))));
      const plant = c2(add(add(multiply(multiply(sj, sj), joint.inertia), multiply(sj, joint.damping)), joint.stiffness));
      const loop = c2(divide(multiply(controller, joint.gearRatio), plant));
      expect(r.loop!.magnitudeDb[i]! - db(abs(loop) as unknown as number)).toBeCloseTo(0, 9);
      const turns = (r.loop!.phaseDeg[i]! - (arg(loop) as unknown as number) * DEG) / 360;
      expect(Math.abs(turns - Math.round(turns))).toBeLessThan(1e-10);
    });
    // PID on a spring-mass: the integrator starts the phase near −90° (the branch of the asymptote).
    expect(r.loop!.phaseDeg[0]).toBeGreaterThan(-90);
    expect(r.loop!.phaseDeg[0]).toBeLessThan(-85);
  });
});

describe('frequency grid', () => {
  it('log-spaced with both ends exact, and bad grids name the field', () => {
    const g = logFrequencies({ from: 1, to: 1000, points: 4 });
    expect(g.ok && g.value).toEqual([1, 10, 100, 1000].map((x, i) => (i === 0 || i === 3 ? x : expect.closeTo(x, 12))));
    const bad = (from: number, to: number, points: number) => {
      const r = logFrequencies({ from, to, points });
      return r.ok ? [] : r.errors.map((e) => e.field);
    };
    expect(bad(0, 10, 10)).toEqual(['from']);
    expect(bad(10, 1, 10)).toEqual(['to']);
    expect(bad(1, Number.POSITIVE_INFINITY, 10)).toEqual(['to']);
    expect(bad(1, 10, 1)).toEqual(['points']);
    expect(bad(1, 10, 2.5)).toEqual(['points']);
    expect(bad(1, 10, 1e6)).toEqual(['points']);
    expect(bad(Number.NaN, 10, 10)).toEqual(['from']);
  });

  it('returns field errors, not a response, for a bad grid', () => {
    const r = frequencyResponseOf(makeScenario({}), { from: 5, to: 5, points: 10 });
    expect(r.ok).toBe(false);
  });
});
