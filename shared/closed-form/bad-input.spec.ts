import { describe, expect, it } from 'vitest';
import { solveClosedForm } from './solve-closed-form';

const good = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'bad input joint',
  joint: { inertia: 0.1, damping: 0.2, stiffness: 0 },
  controller: { mode: 'pid', kp: 4, ki: 1, kd: 0.3 },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5 }],
  horizon: 2,
};

describe('solveClosedForm refuses bad input with the field and the reason', () => {
  it('accepts the base scenario', () => {
    expect(solveClosedForm(good).ok).toBe(true);
  });

  it.each([
    ['non-positive inertia', { joint: { inertia: 0, damping: 0, stiffness: 0 } }, 'joint.inertia', 'positive'],
    ['negative inertia', { joint: { inertia: -1, damping: 0, stiffness: 0 } }, 'joint.inertia', 'positive'],
    ['NaN damping', { joint: { inertia: 1, damping: Number.NaN, stiffness: 0 } }, 'joint.damping', 'finite'],
    ['infinite stiffness', { joint: { inertia: 1, damping: 0, stiffness: Number.POSITIVE_INFINITY } }, 'joint.stiffness', 'finite'],
    ['infinite gain', { controller: { mode: 'pid', kp: Number.NEGATIVE_INFINITY } }, 'controller.kp', 'finite'],
    ['negative delay', { inputs: [{ channel: 'torque', shape: 'step', amplitude: 1, delay: -0.1 }] }, 'inputs.0.delay', 'zero or more'],
    ['negative width', { inputs: [{ channel: 'torque', shape: 'pulse', amplitude: 1, width: -1 }] }, 'inputs.0.width', 'positive'],
    ['reference in open loop', { controller: { mode: 'open-loop' } }, 'inputs.0.channel', 'closed loop'],
    ['reference impulse', { inputs: [{ channel: 'reference', shape: 'impulse', amplitude: 1 }] }, 'inputs.0.channel', 'torque channel'],
    ['zero horizon', { horizon: 0 }, 'horizon', 'positive'],
    ['absurdly long horizon', { horizon: 1e7 }, 'horizon', 'at most'],
    ['NaN amplitude', { inputs: [{ channel: 'torque', shape: 'step', amplitude: Number.NaN }] }, 'inputs.0.amplitude', 'finite'],
    ['missing frequency', { inputs: [{ channel: 'torque', shape: 'sine', amplitude: 1 }] }, 'inputs.0.frequency', 'required'],
    ['too many terms', { inputs: Array.from({ length: 65 }, () => ({ channel: 'torque', shape: 'step', amplitude: 1 })) }, 'inputs', 'at most 64'],
    ['not a scenario at all', { kind: 'other' }, 'kind', 'kinetwin/scenario'],
  ])('%s', (_what, patch, field, reason) => {
    const result = solveClosedForm({ ...good, ...patch });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    const hit = result.errors.find((e) => e.field === field);
    expect(hit, JSON.stringify(result.errors)).toBeDefined();
    expect(hit!.message).toContain(reason);
  });

  it('refuses null and non-object input', () => {
    for (const input of [null, 42, 'scenario', []]) expect(solveClosedForm(input).ok).toBe(false);
  });

  it('refuses an ill-conditioned loop whose poles span more than 12 decades', () => {
    const result = solveClosedForm({ ...good, joint: { inertia: 1, damping: 1e7, stiffness: 1e-7 }, controller: { mode: 'open-loop' }, inputs: [] });
    expect(result).toMatchObject({ ok: false, errors: [{ field: 'joint', message: expect.stringContaining('decades') }] });
  });

  it('refuses a horizon over which an unstable response would overflow', () => {
    const result = solveClosedForm({ ...good, joint: { inertia: 1, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kp: 1, ki: 10 }, horizon: 3600 });
    expect(result).toMatchObject({ ok: false, errors: [{ field: 'horizon', message: expect.stringContaining('shorten the horizon') }] });
  });

  it('refuses an unknown settling band', () => {
    const result = solveClosedForm(good, { settlingBand: 0.1 as 0.02 });
    expect(result).toMatchObject({ ok: false, errors: [{ field: 'options.settlingBand' }] });
  });

  it('notes that a sample period is ignored by the continuous closed form', () => {
    const result = solveClosedForm({ ...good, controller: { ...good.controller, samplePeriod: 0.001 } });
    expect(result.ok && result.value.notes[0]).toContain('samplePeriod');
  });
});
