import { describe, expect, it } from 'vitest';
import { applyFieldEdits, effectiveFieldEdits, fieldValueText, valueAtPath } from './field-edits';
import { parseScenario } from './parse-scenario';
import type { Scenario } from './scenario-schema';
import { amplitudeUnit, termKeys } from './term-units';

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
  nonlinear: { gravity: { mass: 0.3, arm: 0.1, offset: 0, acceleration: 9.81 } },
};

describe('applyFieldEdits', () => {
  it('applies numeric, nested and choice edits, validates the result and leaves the base untouched', () => {
    const edited = applyFieldEdits(saved, { 'controller.kp': ' 3.5 ', 'controller.derivativeOn': 'measurement', 'inputs.0.delay': '1e-1', horizon: '4', 'nonlinear.gravity.mass': '0.5' });
    expect(edited.ok).toBe(true);
    if (!edited.ok) return;
    expect(edited.value.controller.kp).toBe(3.5);
    expect(edited.value.controller.derivativeOn).toBe('measurement');
    expect(edited.value.inputs[0]!.delay).toBe(0.1);
    expect(edited.value.horizon).toBe(4);
    expect(edited.value.nonlinear.gravity?.mass).toBe(0.5);
    expect(saved.controller.kp).toBe(2);
  });

  it('names the path and the text when the text is no plain decimal, and asks for an empty one', () => {
    const edited = applyFieldEdits(saved, { 'controller.kd': '0x10', 'joint.inertia': '', 'joint.stiffness': 'Infinity', 'nonlinear.gravity.arm': 'abc' });
    expect(edited).toEqual({
      ok: false,
      errors: [
        { field: 'controller.kd', message: 'kd must be a finite number, got "0x10"' },
        { field: 'joint.inertia', message: 'inertia is required' },
        { field: 'joint.stiffness', message: 'stiffness must be a finite number, got "Infinity"' },
        { field: 'nonlinear.gravity.arm', message: 'gravity.arm must be a finite number, got "abc"' },
      ],
    });
  });

  it("passes on the schema's message for a value out of range, and for a choice the schema refuses", () => {
    expect(applyFieldEdits(saved, { 'joint.inertia': '-0.2', 'controller.derivativeOn': 'both' })).toEqual({
      ok: false,
      errors: [
        { field: 'joint.inertia', message: 'inertia must be positive' },
        { field: 'controller.derivativeOn', message: 'derivativeOn must be "error" or "measurement"' },
      ],
    });
  });

  it('refuses a path that is no catalogued field of this scenario: unknown, absent term field, or text like the name', () => {
    const edited = applyFieldEdits(saved, { 'inputs.3.amplitude': '1', 'inputs.0.width': '0.1', name: 'x', 'joint.kx': '1' });
    expect(edited.ok).toBe(false);
    if (edited.ok) return;
    expect(edited.errors.map((e) => e.message)).toEqual([
      'inputs.3.amplitude is not a field of this scenario',
      'inputs.0.width is not a field of this scenario',
      'name is not a field of this scenario',
      'joint.kx is not a field of this scenario',
    ]);
  });

  it('reports a reference term left behind when the controller is switched to open loop', () => {
    expect(applyFieldEdits(saved, { 'controller.mode': 'open-loop' })).toEqual({
      ok: false,
      errors: [{ field: 'inputs.0.channel', message: 'a reference input needs a closed loop (controller.mode "pid")' }],
    });
  });

  it('sets a nullable limit from its empty state', () => {
    const edited = applyFieldEdits(saved, { 'limits.settlingTime': '1.5' });
    expect(edited.ok && edited.value.limits.settlingTime).toBe(1.5);
  });
});

describe('effectiveFieldEdits', () => {
  it('drops a field typed back to its value, keeps an emptied one and a changed choice', () => {
    expect(effectiveFieldEdits(saved, { 'controller.kp': '2.0', 'controller.ki': '7', 'joint.damping': ' ', 'controller.mode': 'pid', 'controller.derivativeOn': 'measurement' })).toEqual({
      'controller.ki': '7',
      'joint.damping': ' ',
      'controller.derivativeOn': 'measurement',
    });
  });
});

describe('valueAtPath and fieldValueText', () => {
  it('read a dotted path, through arrays, undefined where it leads nowhere', () => {
    expect(valueAtPath(saved, 'inputs.0.amplitude')).toBe(0.5);
    expect(valueAtPath(saved, 'joint.inertia.x')).toBeUndefined();
    expect(valueAtPath(saved, 'inputs.4.delay')).toBeUndefined();
    expect(fieldValueText(saved, 'controller.mode')).toBe('pid');
    expect(fieldValueText(saved, 'limits.settlingTime')).toBe('');
    expect(fieldValueText(saved, 'inputs.0.width')).toBe('');
  });
});

describe('amplitudeUnit and termKeys', () => {
  it('give the amplitude its unit by channel and shape', () => {
    expect(amplitudeUnit('reference', 'step')).toBe('rad');
    expect(amplitudeUnit('torque', 'sine')).toBe('N·m');
    expect(amplitudeUnit('reference', 'ramp')).toBe('rad/s');
    expect(amplitudeUnit('torque', 'ramp')).toBe('N·m/s');
    expect(amplitudeUnit('torque', 'impulse')).toBe('N·m·s');
  });

  it("list a term's fields with the one its shape adds", () => {
    expect(termKeys({ shape: 'step' })).toEqual(['amplitude', 'delay']);
    expect(termKeys({ shape: 'pulse' })).toEqual(['amplitude', 'delay', 'width']);
    expect(termKeys({ shape: 'cosine' })).toEqual(['amplitude', 'delay', 'frequency']);
    expect(termKeys({ shape: 'decay' })).toEqual(['amplitude', 'delay', 'rate']);
  });

  describe('twin effects', () => {
    const parsedBase = parseScenario({
      kind: 'kinetwin/scenario', version: 1, name: 'effects',
      joint: { inertia: 0.05, damping: 0.1, stiffness: 0 },
      controller: { mode: 'pid', kp: 4, kd: 0.3 },
      horizon: 2,
      nonlinear: { coulombFriction: 0.02 },
    });
    if (!parsedBase.ok) throw new Error('fixture invalid');
    const base = parsedBase.value;

    it('adds an effect the scenario lacks and turns one off when its field is emptied', () => {
      const limited = applyFieldEdits(base, { 'nonlinear.torqueLimit': '1.5', 'nonlinear.coulombFriction': ' ' });
      expect(limited.ok && limited.value.nonlinear).toEqual({ torqueLimit: 1.5 });
      expect(effectiveFieldEdits(base, { 'nonlinear.deadBand': '' })).toEqual({});
    });

    it('refuses a field of a gravity load the scenario does not have, and out-of-range values by name', () => {
      const arm = applyFieldEdits(base, { 'nonlinear.gravity.arm': '0.3' });
      expect(arm.ok ? null : arm.errors[0]!.field).toBe('nonlinear.gravity.arm');
      const negative = applyFieldEdits(base, { 'nonlinear.deadBand': '-1' });
      expect(negative.ok ? null : negative.errors.map((error) => error.field)).toContain('nonlinear.deadBand');
    });
  });
});
