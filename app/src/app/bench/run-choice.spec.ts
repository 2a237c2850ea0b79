import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { runChoice } from './run-choice';

// Invented demo values; keys in another order than the schema's, as a database may return them.
const saved = {
  version: 1,
  kind: 'kinetwin/scenario',
  name: 'Demo elbow',
  notes: '',
  joint: { damping: 0.02, inertia: 0.02, stiffness: 1.5, gearRatio: 1 },
  controller: { mode: 'pid', kp: 1, ki: 0.5, kd: 0.05, derivativeOn: 'measurement', derivativeFilter: 0, samplePeriod: null },
  initial: { angle: 0, velocity: 0 },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.2, delay: 0 }],
  horizon: 3,
  limits: { overshootPercent: null, settlingTime: null, steadyStateError: null },
  nonlinear: {},
} as Scenario;

describe('runChoice', () => {
  it('runs the stored scenario by id when nothing was edited', () => {
    expect(runChoice(7, saved, {})).toEqual({ ok: true, request: { scenarioId: 7 }, scenario: saved, inline: false });
  });

  it('runs by id when the edits only retype saved values', () => {
    const choice = runChoice(7, saved, { 'controller.kp': '1.000', 'joint.inertia': '2e-2' });
    expect(choice).toEqual({ ok: true, request: { scenarioId: 7 }, scenario: saved, inline: false });
  });

  it('sends the edited scenario inline when an edit changes it', () => {
    const choice = runChoice(7, saved, { 'controller.kd': '0.08' });
    expect(choice.ok).toBe(true);
    if (!choice.ok) return;
    expect(choice.inline).toBe(true);
    expect(choice.request.scenarioId).toBeUndefined();
    expect(choice.request.scenario?.controller?.kd).toBe(0.08);
    expect(choice.scenario.controller.kd).toBe(0.08);
    expect(choice.scenario.joint).toEqual(saved.joint);
  });

  it('gives the errors instead of a request for invalid edits', () => {
    expect(runChoice(7, saved, { 'joint.inertia': '0' })).toEqual({ ok: false, errors: [{ field: 'joint.inertia', message: 'inertia must be positive' }] });
  });

  it('sends the kept kicks inline after the saved inputs, with edits reaching them', () => {
    const kick = { channel: 'torque', shape: 'impulse', amplitude: 0.02, delay: 0.8 } as const;
    const choice = runChoice(7, saved, { 'inputs.1.amplitude': '0.03' }, [kick]);
    expect(choice.ok && choice.inline).toBe(true);
    expect(choice.ok && choice.scenario.inputs.map((term) => [term.shape, term.amplitude])).toEqual([['step', 0.2], ['impulse', 0.03]]);
  });
});
