import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { DEFAULT_LOCUS_TEXTS, defaultLocusRange, defaultRangeText, locusRequestOf } from './root-locus-input';

// Demo data (invented numbers): the wrist demo's PD loop with ki = 0.
function wrist(): Scenario {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Wrist pitch',
    joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
    controller: { mode: 'pid', kp: 6, ki: 0, kd: 0.4, derivativeOn: 'measurement' },
    horizon: 2,
  });
  if (!parsed.ok) throw new Error('fixture invalid');
  return parsed.value;
}

describe('root-locus range', () => {
  it('defaults to 0 … 3× the draft gain, or 0 … 1 for a gain at 0', () => {
    expect(defaultLocusRange(wrist(), 'kp')).toEqual({ from: 0, to: 18 });
    expect(defaultLocusRange(wrist(), 'kd')).toEqual({ from: 0, to: 1.2000000000000002 });
    expect(defaultLocusRange(wrist(), 'ki')).toEqual({ from: 0, to: 1 });
    expect(defaultRangeText(wrist(), 'kp')).toBe("0 to 18 (3× the draft's kp)");
    expect(defaultRangeText(wrist(), 'ki')).toBe("0 to 1 (the draft's ki is 0)");
  });

  it('fills blank ends with the default and reads typed ones', () => {
    expect(locusRequestOf(wrist(), DEFAULT_LOCUS_TEXTS)).toEqual({ ok: true, value: { gain: 'kp', from: 0, to: 18, points: 200, spacing: 'linear' } });
    expect(locusRequestOf(wrist(), { gain: 'kd', from: '0.01', to: ' 4 ', points: '50', spacing: 'log' })).toEqual({ ok: true, value: { gain: 'kd', from: 0.01, to: 4, points: 50, spacing: 'log' } });
  });

  it('names the field of text that is not a number, and requires the point count', () => {
    const r = locusRequestOf(wrist(), { ...DEFAULT_LOCUS_TEXTS, from: 'low', points: '' });
    expect(r).toEqual({
      ok: false,
      errors: [
        { field: 'from', message: 'must be a number, got "low"' },
        { field: 'points', message: 'is required' },
      ],
    });
  });
});
