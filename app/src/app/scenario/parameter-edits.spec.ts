import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { applyParameterEdits, effectiveEdits, parameterValue } from './parameter-edits';

// Demo data (invented numbers): the gantry demo scenario's joint and loop.
const gantry = (() => {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Gantry',
    joint: { inertia: 0.05, damping: 0.1, stiffness: 0.2, gearRatio: 5 },
    controller: { mode: 'pid', kp: 4, ki: 6, kd: 0.2, derivativeFilter: 0.002 },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }],
    horizon: 3,
  });
  if (!parsed.ok) throw new Error('fixture invalid');
  return parsed.value;
})();

describe('applyParameterEdits', () => {
  it('sets the edited numbers and leaves the rest of the scenario as it was', () => {
    const result = applyParameterEdits(gantry, { 'controller.kp': ' 6.5 ', horizon: '4' });
    expect(result.ok).toBe(true);
    const value = (result as { value: Scenario }).value;
    expect(value.controller.kp).toBe(6.5);
    expect(value.horizon).toBe(4);
    expect(value.joint).toEqual(gantry.joint);
    expect(gantry.controller.kp).toBe(4);
  });

  it('refuses text that is not a plain decimal number, naming the field', () => {
    const result = applyParameterEdits(gantry, { 'controller.kd': '0x10', 'joint.inertia': '' });
    expect(result).toEqual({
      ok: false,
      errors: [
        { field: 'controller.kd', message: 'kd must be a finite number, got "0x10"' },
        { field: 'joint.inertia', message: 'inertia is required' },
      ],
    });
  });

  it('passes on the schema rule a number breaks', () => {
    const result = applyParameterEdits(gantry, { 'joint.inertia': '-1' });
    expect(result.ok).toBe(false);
    expect((result as { errors: { field: string }[] }).errors.map((e) => e.field)).toEqual(['joint.inertia']);
  });
});

describe('effectiveEdits', () => {
  it('drops a field typed back to its stored value', () => {
    expect(effectiveEdits(gantry, { 'controller.kp': '4.0', 'controller.ki': '7' })).toEqual({ 'controller.ki': '7' });
    expect(parameterValue(gantry, 'joint.gearRatio')).toBe(5);
  });
});
