import { describe, expect, it } from 'vitest';
import { MAX_INPUT_TERMS, type Scenario } from '../scenario/scenario-schema';
import { buildScenario } from './testing/build-scenario';
import { admitKick, type KickContext, withAppendedTerms } from './kick-rule';

const live: KickContext = { done: false, time: 0.3, horizon: 2, closedLoop: true, termCount: 1, mergeEps: 1e-12 };
const impulse = { channel: 'torque', shape: 'impulse', amplitude: 0.01 } as const;

const fieldOf = (result: ReturnType<typeof admitKick>) => (result.ok ? null : result.errors[0]!.field);

describe('the kick rule', () => {
  it('starts a kick now unless it names a later start', () => {
    const now = admitKick(impulse, live);
    expect(now.ok && now.value.delay).toBe(0.3);
    const later = admitKick({ ...impulse, delay: 1.5 }, live);
    expect(later.ok && later.value.delay).toBe(1.5);
  });

  it('moves a kick a roundoff in the past to now, and refuses one further back', () => {
    const roundoff = admitKick({ ...impulse, delay: 0.3 - 1e-13 }, live);
    expect(roundoff.ok && roundoff.value.delay).toBe(0.3);
    expect(fieldOf(admitKick({ ...impulse, delay: 0.2 }, live))).toBe('delay');
  });

  it('refuses a kick at the horizon, on a reference the loop lacks, past the term limit, or after the end', () => {
    expect(fieldOf(admitKick({ ...impulse, delay: 2 }, live))).toBe('delay');
    expect(fieldOf(admitKick({ channel: 'reference', shape: 'step', amplitude: 0.1 }, { ...live, closedLoop: false }))).toBe('channel');
    expect(admitKick(impulse, { ...live, termCount: MAX_INPUT_TERMS }).ok).toBe(false);
    expect(admitKick(impulse, { ...live, termCount: MAX_INPUT_TERMS - 1 }).ok).toBe(true);
    expect(admitKick(impulse, { ...live, done: true }).ok).toBe(false);
  });
});

describe('appending terms to a scenario', () => {
  const base: Scenario = buildScenario();
  const kick = { channel: 'torque', shape: 'impulse', amplitude: 0.02, delay: 0.4 } as const;

  it('puts the terms after the scenario\'s own, leaving the scenario untouched', () => {
    const appended = withAppendedTerms(base, [kick]);
    expect(appended.ok && appended.value.inputs).toEqual([...base.inputs, kick]);
    expect(base.inputs).not.toContain(kick);
    expect(withAppendedTerms(base, [])).toEqual({ ok: true, value: base });
  });

  it('refuses to pass the term limit, naming the inputs', () => {
    const room = MAX_INPUT_TERMS - base.inputs.length;
    expect(withAppendedTerms(base, Array.from({ length: room }, () => kick)).ok).toBe(true);
    const over = withAppendedTerms(base, Array.from({ length: room + 1 }, () => kick));
    expect(over.ok ? null : over.errors[0]!.field).toBe('inputs');
  });
});
