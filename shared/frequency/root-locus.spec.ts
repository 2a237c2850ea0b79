import { describe, expect, it } from 'vitest';
import { makeScenario } from '../closed-form/testing/make-scenario';
import { loopChannelsOf } from './loop-channels';
import { polynomialRoots } from '../closed-form/polynomial-roots';
import { rootLocus } from './root-locus';

describe('root locus', () => {
  it('P control of J s² + b s: two real poles meet at −b/(2J) when kp = b²/(4J), then part as −b/(2J) ± j√(4J kp − b²)/(2J) (the quadratic formula; common practice)', () => {
    const [J, b] = [0.5, 3];
    const scenario = makeScenario({ joint: { inertia: J, damping: b, stiffness: 0 }, controller: { mode: 'pid', kp: 1 } });
    const breakaway = (b * b) / (4 * J);
    const r = rootLocus(scenario, { gain: 'kp', from: 0, to: 4 * breakaway, points: 5, spacing: 'linear' });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.value.values).toEqual([0, breakaway, 2 * breakaway, 3 * breakaway, 4 * breakaway]);
    const [atBreakaway, after] = [r.value.poles[1]!, r.value.poles[4]!];
    for (const p of atBreakaway) {
      expect(p.re).toBeCloseTo(-b / (2 * J), 6);
      expect(Math.abs(p.im)).toBeLessThan(1e-6);
    }
    const im = Math.sqrt(4 * J * 4 * breakaway - b * b) / (2 * J);
    expect(after.map((p) => p.re)).toEqual([expect.closeTo(-b / (2 * J), 10), expect.closeTo(-b / (2 * J), 10)]);
    expect(after.map((p) => Math.abs(p.im))).toEqual([expect.closeTo(im, 10), expect.closeTo(im, 10)]);
    // kp = 0: the open-loop poles 0 and −b/J.
    expect(r.value.poles[0]!.map((p) => p.re).sort((x, y) => x - y)).toEqual([expect.closeTo(-b / J, 12), expect.closeTo(0, 12)]);
  });

  it('integral action on (s + 1)(s + 2): the locus crosses the imaginary axis at ±j√2 when ki = 6 (Routh–Hurwitz; common practice)', () => {
    const scenario = makeScenario({ joint: { inertia: 1, damping: 3, stiffness: 2 }, controller: { mode: 'pid', ki: 2 } });
    const r = rootLocus(scenario, { gain: 'ki', from: 0.5, to: 12, points: 2, spacing: 'log' });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const crossing = rootLocus(scenario, { gain: 'ki', from: 5, to: 6, points: 2, spacing: 'linear' });
    if (!crossing.ok) throw new Error('refused');
    const onAxis = crossing.value.poles[1]!.filter((p) => Math.abs(p.im) > 0.1);
    expect(onAxis.map((p) => p.re)).toEqual([expect.closeTo(0, 10), expect.closeTo(0, 10)]);
    expect(onAxis.map((p) => Math.abs(p.im))).toEqual([expect.closeTo(Math.SQRT2, 10), expect.closeTo(Math.SQRT2, 10)]);
    // The current gain's poles are the closed form's poles of the scenario itself.
    const own = polynomialRoots(loopChannelsOf(scenario).characteristic);
    if (!own.ok) throw new Error('roots');
    const key = (ps: { re: number; im: number }[]) => ps.map((p) => [p.re.toFixed(9), p.im.toFixed(9)].join()).sort();
    expect(key(r.value.current.poles)).toEqual(key(own.roots));
    expect(r.value.current.value).toBe(2);
  });

  it('keeps each branch continuous from one gain value to the next', () => {
    const scenario = makeScenario({ joint: { inertia: 0.05, damping: 0.2, stiffness: 1 }, controller: { mode: 'pid', kp: 10, ki: 5, kd: 0.3, derivativeFilter: 0.01 } });
    // Along kp the complex pair's real part passes a real pole's: the solver's own order (by real
    // part) then swaps branches, which the matching must undo.
    const r = rootLocus(scenario, { gain: 'kp', from: 0, to: 200, points: 2000, spacing: 'linear' });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const degree = r.value.poles[0]!.length;
    expect(degree).toBe(4);
    expect(r.value.poles.every((ps) => ps.length === degree)).toBe(true);
    for (let i = 1; i < r.value.poles.length; i++) {
      r.value.poles[i]!.forEach((p, j) => {
        const q = r.value.poles[i - 1]![j]!;
        // Steps of 0.1 in kp: every branch moves a little (near a breakaway like √Δkp), none leaps.
        expect(Math.hypot(p.re - q.re, p.im - q.im)).toBeLessThan(0.25 * Math.max(1, Math.hypot(q.re, q.im)));
      });
    }
  });

  it('refuses an open loop and bad ranges, naming the field', () => {
    const fields = (patch: Parameters<typeof makeScenario>[0], req: Partial<Parameters<typeof rootLocus>[1]>) => {
      const r = rootLocus(makeScenario(patch), { gain: 'kp', from: 0, to: 10, points: 10, spacing: 'linear', ...req });
      return r.ok ? [] : r.errors.map((e) => e.field);
    };
    expect(fields({}, {})).toEqual(['controller.mode']);
    const pid = { controller: { mode: 'pid' as const, kp: 1 } };
    expect(fields(pid, { to: 0 })).toEqual(['to']);
    expect(fields(pid, { spacing: 'log' })).toEqual(['from']);
    expect(fields(pid, { points: 1 })).toEqual(['points']);
    expect(fields(pid, { from: Number.NaN })).toEqual(['from', 'to']);
  });
});
