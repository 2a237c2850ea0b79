import { rootLocus } from '@kinetwin/shared/frequency/root-locus';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import { locusFigure, locusReadout } from './root-locus-figure';

// Invented demo values: J = 1, b = 3, k = 2 under integral action only, L = ki/(s(s+1)(s+2)):
// the closed loop s³ + 3s² + 2s + ki turns unstable at ki = 6, where it has poles ±j√2
// (Routh–Hurwitz on the classic third-order example; common practice).
function locusOver(to: number, points = 121) {
  const parsed = parseScenario({ kind: 'kinetwin/scenario', version: 1, name: 'Demo loop', joint: { inertia: 1, damping: 3, stiffness: 2 }, controller: { mode: 'pid', kp: 0, ki: 1, kd: 0 }, horizon: 1 });
  if (!parsed.ok) throw new Error('fixture invalid');
  const r = rootLocus(parsed.value, { gain: 'ki', from: 0, to, points, spacing: 'linear' });
  if (!r.ok) throw new Error('refused');
  return r.value;
}

describe('locusFigure', () => {
  it('draws one line per branch, the start, the draft poles and the imaginary axis', () => {
    const locus = locusOver(12);
    const { data, layout } = locusFigure(locus);
    const lines = data.filter((t) => t.mode === 'lines');
    expect(lines).toHaveLength(3);
    expect(lines.map((t) => [t.name, t.showlegend])).toEqual([
      ['branches', true],
      ['branch 2', false],
      ['branch 3', false],
    ]);
    expect(lines[1]!.x).toEqual(locus.poles.map((p) => p[1]!.re));
    expect(lines[1]!.y).toEqual(locus.poles.map((p) => p[1]!.im));
    expect(lines[0]!.customdata).toBe(locus.values);
    const current = data.find((t) => t.name === 'poles at ki = 1')!;
    expect(current.mode).toBe('markers');
    expect(current.x).toEqual(locus.current.poles.map((p) => p.re));
    expect(current.y).toEqual(locus.current.poles.map((p) => p.im));
    expect(data.find((t) => t.name === 'start, ki = 0')!.x).toEqual(locus.poles[0]!.map((p) => p.re));
    const axis = layout.shapes!.find((s) => s.xref === 'x')!;
    expect([axis.x0, axis.x1, axis.yref]).toEqual([0, 0, 'paper']);
  });
});

describe('locusReadout', () => {
  it('says where a pole crosses the imaginary axis, bracketing ki = 6', () => {
    // 100 values: ki = 6 falls between two of them (5.939 and 6.061).
    const r = locusReadout(locusOver(12, 100), 'linear');
    expect(r.changes).toEqual(['A pole crosses into the right half-plane between ki = 5.939 and 6.061: the loop turns unstable.']);
    expect(r.range).toBe("ki from 0 to 12, 100 values, linear spacing; the other gains held at the draft's.");
  });

  it("lists the draft's poles, a conjugate pair on one line", () => {
    const r = locusReadout(locusOver(3), 'linear');
    expect(r.currentLabel).toBe("Poles at ki = 1 (the draft's)");
    // s³ + 3s² + 2s + 1: one real pole near −2.325 and a pair near −0.338 ± 0.562j (solved numerically).
    expect(r.currentPoles.map((p) => p.text)).toEqual(['-0.3376 ± 0.5623j rad/s', '-2.325 rad/s']);
    expect(r.changes).toEqual(['Every pole stays left of the imaginary axis over the whole range: the loop is stable throughout.']);
  });
});
