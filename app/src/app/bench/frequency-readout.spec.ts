import { type FrequencyResponse, frequencyResponseOf } from '@kinetwin/shared/frequency/frequency-response';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { UNSTABLE_PLANT_CAUTION, formatDegrees, frequencyReadout } from './frequency-readout';
import { formatQuantity } from './scenario-facts';

// Invented demo values, chosen for loops whose margins are solved by hand.
function scenario(joint: Record<string, number>, controller: Record<string, unknown>, nonlinear: Record<string, unknown> = {}): Scenario {
  const parsed = parseScenario({ kind: 'kinetwin/scenario', version: 1, name: 'Demo loop', joint, controller, inputs: [], horizon: 1, nonlinear });
  if (!parsed.ok) throw new Error(`fixture invalid: ${JSON.stringify(parsed.errors)}`);
  return parsed.value;
}

function responseOf(s: Scenario, grid = { from: 0.01, to: 100, points: 200 }): FrequencyResponse {
  const result = frequencyResponseOf(s, grid);
  if (!result.ok) throw new Error('grid refused');
  return result.value;
}

/** The first number in a read-out text. */
const numberIn = (text: string) => Number(/-?[0-9.]+(e[+-]?\d+)?/.exec(text)![0]);

describe('frequencyReadout', () => {
  it('gives the gain margin at the phase crossover of K/(s(s+1)(s+2))', () => {
    // Integral action only on J = 1, b = 3, k = 2: L = ki/(s(s+1)(s+2)). Phase −180° where
    // atan ω + atan(ω/2) = 90°, i.e. ω = √2; there |L| = ki/6, so GM = 20·log10(6/ki) (the
    // classic third-order example, critical gain 6 by Routh–Hurwitz; common practice).
    const r = frequencyReadout(responseOf(scenario({ inertia: 1, damping: 3, stiffness: 2 }, { mode: 'pid', kp: 0, ki: 1, kd: 0 })));
    const gain = r.margins.find((m) => m.key === 'gainMargin')!;
    expect(gain.defined).toBe(true);
    expect(gain.value).toBe(formatQuantity(20 * Math.log10(6), 'dB'));
    expect(gain.detail).toBe(`at the phase crossover, ${formatQuantity(Math.SQRT2, 'rad/s')}`);
    expect(r.stability).toBe('stable');
    expect(r.tone).toBe('good');
    expect(r.verdict).toBe('stable loop');
    expect(r.caution).toBeNull();
    expect(r.delayModel).toBeNull();
  });

  it('gives the phase margin at the gain crossover and the −3 dB bandwidth of a second-order loop', () => {
    // P only, kp = √2, on J = 1, b = 1: L = √2/(s(s+1)); |L| = 1 at ω = 1 (ω⁴ + ω² = 2), where the
    // phase is −90° − 45°, so PM = 45°; no phase crossover, so the gain margin is unbounded.
    const r = frequencyReadout(responseOf(scenario({ inertia: 1, damping: 1, stiffness: 0 }, { mode: 'pid', kp: Math.SQRT2 })));
    const [gain, phase, bandwidth] = r.margins;
    expect(phase).toEqual({ key: 'phaseMargin', label: 'Phase margin', value: formatDegrees(45), detail: `at the gain crossover, ${formatQuantity(1, 'rad/s')}`, defined: true });
    expect(gain).toEqual({ key: 'gainMargin', label: 'Gain margin', value: 'unbounded', detail: 'no phase crossover', defined: false });
    // Θ/R = ωn²/(s² + 2ζωn s + ωn²) with ωn² = √2, 2ζωn = 1: ωb = ωn·√(1 − 2ζ² + √(4ζ⁴ − 4ζ² + 2))
    // (Ogata, Modern Control Engineering, frequency-response chapter, from memory).
    const wn = Math.sqrt(Math.SQRT2);
    const zeta = 1 / (2 * wn);
    const wb = wn * Math.sqrt(1 - 2 * zeta ** 2 + Math.sqrt(4 * zeta ** 4 - 4 * zeta ** 2 + 2));
    expect(bandwidth!.defined).toBe(true);
    expect(Math.abs(numberIn(bandwidth!.value) - wb) / wb).toBeLessThan(5e-4);
    expect(bandwidth!.value).toMatch(/ rad\/s$/);
    // Every note after the verdict is kept, in order.
    expect(r.notes).toEqual(['no phase crossover: the loop phase never reaches −180°, so the gain margin is unbounded']);
    expect(r.paths).toContain('loop L(jω)');
  });

  it('marks a crossover outside the plotted range', () => {
    const r = frequencyReadout(responseOf(scenario({ inertia: 1, damping: 1, stiffness: 0 }, { mode: 'pid', kp: Math.SQRT2 }), { from: 10, to: 1000, points: 50 }));
    expect(r.margins.find((m) => m.key === 'phaseMargin')!.detail).toBe(`at the gain crossover, ${formatQuantity(1, 'rad/s')} (outside the plotted range)`);
  });

  it('has no margins in open loop and says why', () => {
    const response = responseOf(scenario({ inertia: 0.01, damping: 0, stiffness: 0 }, { mode: 'open-loop' }));
    const r = frequencyReadout(response);
    expect(r.margins).toEqual([]);
    expect(r.stability).toBe('no-loop');
    expect(r.tone).toBe('neutral');
    expect(r.verdict).toBe(response.notes[0]);
    expect(r.verdict).toContain('open loop');
    expect(r.paths).toMatch(/^Open loop: only torque → angle is drawn/);
  });

  it('carries the delay model of a sampled controller and its Nyquist note', () => {
    const r = frequencyReadout(responseOf(scenario({ inertia: 0.012, damping: 0.04, stiffness: 0 }, { mode: 'pid', kp: 6, ki: 1, kd: 0.4, samplePeriod: 0.001 }, { torqueLimit: 2 })));
    expect(r.delayModel).toMatch(/^sampled controller: .*zero-order hold/);
    expect(r.notes).toContain('stability decided by the Nyquist criterion on the frequency response with the sampled delay');
    expect(r.notes.at(-1)).toBe("the linear model's response: the torque limit is not in it");
  });

  it('adds the caution when a note says the open-loop plant is unstable', () => {
    // Shaped like the shared margin report for a plant with a right-half-plane pole (the scenario
    // schema cannot hold one yet: stiffness and damping are ≥ 0).
    const base = responseOf(scenario({ inertia: 1, damping: 3, stiffness: 2 }, { mode: 'pid', kp: 0, ki: 1, kd: 0 }));
    const plantNote = 'the open-loop plant is unstable (1 pole in the right half-plane): positive margins alone do not mean a stable loop';
    const r = frequencyReadout({ ...base, stability: 'unstable', notes: ['unstable loop', plantNote] });
    expect(r.caution).toBe(UNSTABLE_PLANT_CAUTION);
    expect(r.tone).toBe('bad');
    expect(r.notes).toEqual([plantNote]);
  });
});
