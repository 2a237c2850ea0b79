import { catalogueEntry, fieldLabel } from '@kinetwin/shared/scenario/parameter-catalogue';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { readOnlyFacts } from './read-only-facts';

// Invented demo values.
const scenario: Scenario = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'Demo gantry',
  notes: '',
  joint: { inertia: 0.05, damping: 0.1, stiffness: 0.2, gearRatio: 5 },
  controller: { mode: 'pid', kp: 4, ki: 6, kd: 0.2, derivativeOn: 'measurement', derivativeFilter: 0.002, samplePeriod: null },
  initial: { angle: 0.1, velocity: 0 },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 1, delay: 0 }],
  horizon: 3,
  limits: { overshootPercent: null, settlingTime: null, steadyStateError: null },
  nonlinear: {},
};

describe('readOnlyFacts', () => {
  it('lists joint, controller with its mode and derivative-on in words, initial state and horizon, numbers exactly', () => {
    const facts = readOnlyFacts(scenario);
    expect(facts.map((f) => f.path)).toEqual([
      'joint.inertia',
      'joint.damping',
      'joint.stiffness',
      'joint.gearRatio',
      'controller.mode',
      'controller.kp',
      'controller.ki',
      'controller.kd',
      'controller.derivativeOn',
      'controller.derivativeFilter',
      'initial.angle',
      'initial.velocity',
      'horizon',
      // Twin effects, each "none" while the scenario leaves it out (gravity's fields only with a gravity load).
      'nonlinear.torqueLimit',
      'nonlinear.coulombFriction',
      'nonlinear.staticFriction',
      'nonlinear.torqueOffset',
      'nonlinear.deadBand',
      'nonlinear.encoderCounts',
      'nonlinear.noiseStdDev',
      'nonlinear.noiseSeed',
    ]);
    const byPath = Object.fromEntries(facts.map((f) => [f.path, f]));
    expect(byPath['controller.mode']).toEqual({ path: 'controller.mode', label: 'Controller', value: 'PID loop', unit: '' });
    expect(byPath['joint.inertia']).toEqual({ path: 'joint.inertia', label: fieldLabel(catalogueEntry('joint.inertia')), value: '0.05', unit: 'kg·m²' });
    expect(byPath['initial.angle']!.value).toBe('0.1');
    expect(byPath['nonlinear.torqueLimit']).toMatchObject({ value: 'none', unit: 'N·m' });
  });
});
