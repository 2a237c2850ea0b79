import { catalogueEntry, fieldLabel } from '@kinetwin/shared/scenario/parameter-catalogue';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { describeInputTerm, formatQuantity, formatResult, RESULT_RESOLUTION, scenarioFacts } from './scenario-facts';

// Invented demo values.
const scenario: Scenario = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'Demo elbow',
  notes: '',
  joint: { inertia: 0.02, damping: 0.1, stiffness: 0, gearRatio: 50 },
  controller: { mode: 'pid', kp: 1.5, ki: 0, kd: 0.08, derivativeOn: 'measurement', derivativeFilter: 0.005, samplePeriod: null },
  initial: { angle: 0, velocity: 0 },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0 }],
  horizon: 2,
  limits: { overshootPercent: null, settlingTime: null, steadyStateError: null },
  nonlinear: {},
};

describe('formatQuantity', () => {
  it('shows four significant figures without trailing zeros', () => {
    expect(formatQuantity(0.02, 'kg·m²')).toBe('0.02 kg·m²');
    expect(formatQuantity(3.14159265)).toBe('3.142');
    expect(formatQuantity(0)).toBe('0');
    expect(formatQuantity(-12.5, 'N·m')).toBe('-12.5 N·m');
  });

  it('switches to an exponent for tiny and huge magnitudes', () => {
    expect(formatQuantity(2e-5, 's')).toBe('2e-5 s');
    expect(formatQuantity(1.234567e7)).toBe('1.235e+7');
  });
});

describe('formatResult', () => {
  it('shows roundoff below the stated resolution as 0, and anything at or above it as a number', () => {
    expect(formatResult(-2.220446049250313e-16, 'rad')).toBe('0 rad');
    expect(formatResult(-0, 'rad')).toBe('0 rad');
    expect(formatResult(RESULT_RESOLUTION, 'rad')).toBe('1e-12 rad');
    expect(formatResult(0.25, 'rad')).toBe('0.25 rad');
    // Typed parameters are never rounded away.
    expect(formatQuantity(1e-13, 'kg·m²')).toBe('1e-13 kg·m²');
  });
});

describe('describeInputTerm', () => {
  it('names channel, shape, amplitude with its unit and start time', () => {
    expect(describeInputTerm({ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0 })).toBe('reference step 0.5 rad at t = 0 s');
    expect(describeInputTerm({ channel: 'torque', shape: 'impulse', amplitude: 0.01, delay: 1 })).toBe('torque impulse 0.01 N·m·s at t = 1 s');
    expect(describeInputTerm({ channel: 'torque', shape: 'ramp', amplitude: 2, delay: 0.5 })).toBe('torque ramp 2 N·m/s at t = 0.5 s');
  });

  it('adds the width, frequency or rate a shape needs', () => {
    expect(describeInputTerm({ channel: 'torque', shape: 'pulse', amplitude: 1, delay: 0.2, width: 0.1 })).toBe('torque pulse 1 N·m at t = 0.2 s, pulse width w 0.1 s');
    expect(describeInputTerm({ channel: 'reference', shape: 'sine', amplitude: 0.1, delay: 0, frequency: 6.283 })).toBe('reference sine 0.1 rad at t = 0 s, angular frequency ω 6.283 rad/s');
    expect(describeInputTerm({ channel: 'torque', shape: 'decay', amplitude: 1, delay: 0, rate: 3 })).toBe('torque decay 1 N·m at t = 0 s, decay rate λ 3 1/s');
  });
});

describe('scenarioFacts', () => {
  it('labels each fact from the shared catalogue', () => {
    const labels = Object.fromEntries(scenarioFacts(scenario).map((f) => [f.key, f.label]));
    expect(labels['joint.inertia']).toBe(fieldLabel(catalogueEntry('joint.inertia')));
    expect(labels['controller.mode']).toBe('Controller');
  });

  it('shows an unfiltered derivative as none', () => {
    const facts = scenarioFacts({ ...scenario, controller: { ...scenario.controller, derivativeFilter: 0 } });
    expect(facts.find((f) => f.key === 'controller.derivativeFilter')?.value).toBe('none');
  });

  it('lists the joint, the PID gains and the run quantities', () => {
    const facts = Object.fromEntries(scenarioFacts(scenario).map((f) => [f.key, f.value]));
    expect(facts).toMatchObject({
      'joint.inertia': '0.02 kg·m²',
      'joint.damping': '0.1 N·m·s/rad',
      'joint.stiffness': '0 N·m/rad',
      'joint.gearRatio': '50',
      'controller.mode': 'PID loop',
      'controller.kp': '1.5 N·m/rad',
      'controller.kd': '0.08 N·m·s/rad',
      'controller.derivativeOn': 'measurement',
      'controller.derivativeFilter': '0.005 s',
      'initial.angle': '0 rad',
      horizon: '2 s',
    });
  });

  it('leaves the gains out for an open loop', () => {
    const keys = scenarioFacts({ ...scenario, controller: { ...scenario.controller, mode: 'open-loop' } }).map((f) => f.key);
    expect(keys).not.toContain('controller.kp');
    expect(keys).not.toContain('controller.derivativeOn');
    expect(keys).toContain('controller.mode');
  });
});
