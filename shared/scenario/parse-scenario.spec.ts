import { describe, expect, it } from 'vitest';
import { parseScenario, parseScenarioText } from './parse-scenario';
import { scenarioFileText } from './scenario-file';

const minimal = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'bench joint',
  joint: { inertia: 0.02, damping: 0.1, stiffness: 0 },
  controller: { mode: 'pid', kp: 4, kd: 0.3 },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5 }],
  horizon: 2,
};

describe('parseScenario', () => {
  it('fills in every documented default', () => {
    const parsed = parseScenario(minimal);
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.value.joint.gearRatio).toBe(1);
    expect(parsed.value.controller).toMatchObject({ ki: 0, derivativeOn: 'error', derivativeFilter: 0, samplePeriod: null });
    expect(parsed.value.initial).toEqual({ angle: 0, velocity: 0 });
    expect(parsed.value.inputs[0]!.delay).toBe(0);
    expect(parsed.value.limits).toEqual({ overshootPercent: null, settlingTime: null, steadyStateError: null });
    expect(parsed.value.notes).toBe('');
  });

  it.each([
    [{ joint: { inertia: -0.2, damping: 0, stiffness: 0 } }, 'joint.inertia', 'positive'],
    [{ joint: { inertia: Number.NaN, damping: 0, stiffness: 0 } }, 'joint.inertia', 'finite'],
    [{ joint: { inertia: 1, damping: Number.POSITIVE_INFINITY, stiffness: 0 } }, 'joint.damping', 'finite'],
    [{ horizon: 0 }, 'horizon', 'positive'],
    [{ horizon: 1e6 }, 'horizon', 'at most'],
    [{ inputs: [{ channel: 'reference', shape: 'step', amplitude: 1, delay: -1 }] }, 'inputs.0.delay', 'zero or more'],
    [{ inputs: [{ channel: 'torque', shape: 'pulse', amplitude: 1 }] }, 'inputs.0.width', 'required'],
    [{ inputs: [{ channel: 'torque', shape: 'sine', amplitude: 1 }] }, 'inputs.0.frequency', 'required'],
    [{ inputs: [{ channel: 'reference', shape: 'impulse', amplitude: 1 }] }, 'inputs.0.channel', 'torque channel'],
    [{ controller: { mode: 'open-loop' } }, 'inputs.0.channel', 'closed loop'],
    [{ joint: { damping: 0, stiffness: 0 } }, 'joint.inertia', 'required'],
    [{ kind: 'something-else' }, 'kind', 'kinetwin/scenario'],
    [{ extra: 1 }, '', 'extra'],
  ])('refuses %j naming the field', (patch, field, reason) => {
    const parsed = parseScenario({ ...minimal, ...patch });
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    const hit = parsed.errors.find((e) => e.field === field);
    expect(hit, JSON.stringify(parsed.errors)).toBeDefined();
    expect(hit!.message).toContain(reason);
  });

  it('caps the number of input terms', () => {
    const inputs = Array.from({ length: 65 }, () => ({ channel: 'torque', shape: 'step', amplitude: 1 }));
    const parsed = parseScenario({ ...minimal, inputs });
    expect(parsed.ok).toBe(false);
  });

  it('turns a JSON syntax error into a document-level error', () => {
    const parsed = parseScenarioText('{"kind": ');
    expect(parsed).toMatchObject({ ok: false, errors: [{ field: '', message: expect.stringContaining('not valid JSON') }] });
  });
});

describe('scenario files', () => {
  const caution = 'A simulation is not a safety validation.';

  it('carry the caution first in the file and read back to the same scenario', () => {
    const parsed = parseScenario(minimal);
    if (!parsed.ok) throw new Error('fixture invalid');
    const text = scenarioFileText(parsed.value, caution);
    expect(Object.keys(JSON.parse(text))[0]).toBe('safetyCaution');
    expect(JSON.parse(text).safetyCaution).toBe(caution);
    expect(parseScenarioText(text)).toEqual(parsed);
  });

  it('refuse a caution that is not text, naming it', () => {
    const parsed = parseScenarioText(JSON.stringify({ ...minimal, safetyCaution: 3 }));
    expect(parsed.ok ? '' : parsed.errors.map((error) => `${error.field} ${error.message}`).join('; ')).toContain('safetyCaution');
  });
});
