import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { editedScenario, fieldText, samePlainData, valueAtPath } from './scenario-draft';

// Invented demo values.
const saved: Scenario = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'Demo wrist pitch',
  notes: '',
  joint: { inertia: 0.01, damping: 0.05, stiffness: 0, gearRatio: 1 },
  controller: { mode: 'pid', kp: 2, ki: 0, kd: 0.1, derivativeOn: 'error', derivativeFilter: 0, samplePeriod: null },
  initial: { angle: 0, velocity: 0 },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0 }],
  horizon: 2,
  limits: { overshootPercent: null, settlingTime: null, steadyStateError: null },
  nonlinear: {},
};

describe('editedScenario', () => {
  it('applies numeric and choice edits and validates the result', () => {
    const edited = editedScenario(saved, { 'controller.kp': ' 3.5 ', 'controller.derivativeOn': 'measurement', 'inputs.0.delay': '1e-1' });
    expect(edited.ok).toBe(true);
    if (!edited.ok) return;
    expect(edited.value.controller.kp).toBe(3.5);
    expect(edited.value.controller.derivativeOn).toBe('measurement');
    expect(edited.value.inputs[0].delay).toBe(0.1);
    // The saved scenario is untouched.
    expect(saved.controller.kp).toBe(2);
  });

  it("gives the shared schema's message under the field for a value it refuses", () => {
    const edited = editedScenario(saved, { 'joint.inertia': '-0.2', horizon: '7200' });
    expect(edited).toEqual({
      ok: false,
      errors: [
        { field: 'joint.inertia', message: 'inertia must be positive' },
        { field: 'horizon', message: 'horizon must be at most 3600 s: longer runs belong in a batch job, not a bench' },
      ],
    });
  });

  it('names the field and the text when the text is not a number, and asks for an empty one', () => {
    const edited = editedScenario(saved, { 'controller.kd': 'abc', 'controller.kp': '', 'joint.damping': '0x10', 'joint.stiffness': 'Infinity' });
    expect(edited.ok).toBe(false);
    if (edited.ok) return;
    expect(edited.errors).toEqual([
      { field: 'controller.kd', message: 'kd must be a finite number, got "abc"' },
      { field: 'controller.kp', message: 'kp is required' },
      { field: 'joint.damping', message: 'damping must be a finite number, got "0x10"' },
      { field: 'joint.stiffness', message: 'stiffness must be a finite number, got "Infinity"' },
    ]);
  });

  it('reports a reference term left behind when the controller is switched to open loop', () => {
    const edited = editedScenario(saved, { 'controller.mode': 'open-loop' });
    expect(edited.ok).toBe(false);
    if (edited.ok) return;
    expect(edited.errors).toEqual([{ field: 'inputs.0.channel', message: 'a reference input needs a closed loop (controller.mode "pid")' }]);
  });

  it('refuses an edit of a path the scenario does not have', () => {
    const edited = editedScenario(saved, { 'inputs.3.amplitude': '1' });
    expect(edited.ok).toBe(false);
    if (edited.ok) return;
    expect(edited.errors[0]).toEqual({ field: 'inputs.3.amplitude', message: 'inputs.3.amplitude is not a field of this scenario' });
  });
});

describe('fieldText and valueAtPath', () => {
  it('show the edit when there is one, else the saved value', () => {
    expect(fieldText(saved, {}, 'joint.inertia')).toBe('0.01');
    expect(fieldText(saved, { 'joint.inertia': '0.0' }, 'joint.inertia')).toBe('0.0');
    expect(fieldText(saved, {}, 'controller.mode')).toBe('pid');
    expect(fieldText(saved, {}, 'inputs.0.width')).toBe('');
    expect(valueAtPath(saved, 'inputs.0.amplitude')).toBe(0.5);
    expect(valueAtPath(saved, 'joint.inertia.x')).toBeUndefined();
  });
});

describe('samePlainData', () => {
  it('ignores key order and undefined keys but not values', () => {
    expect(samePlainData({ a: 1, b: [1, { c: 2 }] }, { b: [1, { c: 2 }], a: 1, d: undefined })).toBe(true);
    expect(samePlainData({ a: 1 }, { a: 1.0000001 })).toBe(false);
    expect(samePlainData([1, 2], { 0: 1, 1: 2 })).toBe(false);
    expect(samePlainData({ a: null }, { a: 0 })).toBe(false);
  });
});
