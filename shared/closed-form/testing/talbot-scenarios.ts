import { type ScenarioInput } from '../../scenario/scenario-schema';

/**
 * Scenarios checked against the fixed-Talbot inversion. Each lists the times checked; they keep
 * |Im p|·(t − a) within the fixed-Talbot contour at 40–48 nodes (see fixed-talbot.ts). Joint
 * values are invented test data.
 */
export interface TalbotCase {
  title: string;
  scenario: ScenarioInput;
  /** Last time checked, s (15 times are spread over (0, until]). */
  until: number;
}

const base = { kind: 'kinetwin/scenario' as const, version: 1 as const, horizon: 10 };

export const TALBOT_CASES: TalbotCase[] = [
  {
    title: 'open loop, lightly damped pair (ζ = 0.1), torque step',
    scenario: { ...base, name: 'a', joint: { inertia: 1, damping: 0.4, stiffness: 4 }, controller: { mode: 'open-loop' }, inputs: [{ channel: 'torque', shape: 'step', amplitude: 1 }] },
    until: 5,
  },
  {
    title: 'open loop, critically damped (double pole) with an impulse and non-zero initial state',
    scenario: {
      ...base,
      name: 'b',
      joint: { inertia: 1, damping: 4, stiffness: 4 },
      controller: { mode: 'open-loop' },
      initial: { angle: 0.2, velocity: -0.3 },
      inputs: [{ channel: 'torque', shape: 'impulse', amplitude: 0.5, delay: 0.3 }],
    },
    until: 4,
  },
  {
    title: 'open loop free inertia with damping, torque ramp (triple pole at 0)',
    scenario: { ...base, name: 'c', joint: { inertia: 2, damping: 0.5, stiffness: 0 }, controller: { mode: 'open-loop' }, inputs: [{ channel: 'torque', shape: 'ramp', amplitude: 0.3, delay: 0.5 }] },
    until: 6,
  },
  {
    title: 'open loop undamped joint driven at resonance (double poles ±2j)',
    scenario: { ...base, name: 'd', joint: { inertia: 1, damping: 0, stiffness: 4 }, controller: { mode: 'open-loop' }, inputs: [{ channel: 'torque', shape: 'sine', amplitude: 1, frequency: 2 }] },
    until: 5,
  },
  {
    title: 'P loop, lightly damped (ζ = 0.025, ωn = 10 rad/s)',
    scenario: { ...base, name: 'e', joint: { inertia: 0.02, damping: 0.01, stiffness: 0 }, controller: { mode: 'pid', kp: 2 }, inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5 }] },
    until: 1.2,
  },
  {
    title: 'PID unfiltered, derivative on error (kick) plus a delayed torque step',
    scenario: {
      ...base,
      name: 'f',
      joint: { inertia: 0.05, damping: 0.1, stiffness: 0.5 },
      controller: { mode: 'pid', kp: 4, ki: 6, kd: 0.4 },
      inputs: [
        { channel: 'reference', shape: 'step', amplitude: 1 },
        { channel: 'torque', shape: 'step', amplitude: -0.5, delay: 1.5 },
      ],
    },
    until: 3,
  },
  {
    title: 'PID filtered, derivative on measurement, non-zero initial state, delayed cosine reference',
    scenario: {
      ...base,
      name: 'g',
      joint: { inertia: 0.1, damping: 0.2, stiffness: 1 },
      controller: { mode: 'pid', kp: 5, ki: 2, kd: 0.5, derivativeOn: 'measurement', derivativeFilter: 0.02 },
      initial: { angle: -0.1, velocity: 0.4 },
      inputs: [{ channel: 'reference', shape: 'cosine', amplitude: 0.2, frequency: 2, delay: 0.7 }],
    },
    until: 4,
  },
  {
    title: 'geared PID with four superposed inputs (step, delayed ramp, decay, pulse)',
    scenario: {
      ...base,
      name: 'h',
      joint: { inertia: 0.004, damping: 0.002, stiffness: 0, gearRatio: 20 },
      controller: { mode: 'pid', kp: 0.02, ki: 0.01, kd: 0.002, derivativeFilter: 0.01 },
      inputs: [
        { channel: 'reference', shape: 'step', amplitude: 0.3 },
        { channel: 'reference', shape: 'ramp', amplitude: 0.1, delay: 0.8 },
        { channel: 'torque', shape: 'decay', amplitude: 0.05, rate: 3, delay: 0.2 },
        { channel: 'torque', shape: 'pulse', amplitude: -0.02, delay: 0.4, width: 0.3 },
      ],
    },
    until: 2.5,
  },
  {
    title: 'PID placed on a triple pole at −2 (repeated poles), reference step and initial angle',
    scenario: {
      ...base,
      name: 'i',
      joint: { inertia: 1, damping: 0, stiffness: 0 },
      controller: { mode: 'pid', kp: 12, ki: 8, kd: 6 },
      initial: { angle: 0.1, velocity: 0 },
      inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }],
    },
    until: 6,
  },
  {
    title: 'filtered PID placed on a quadruple pole at −2, reference step and delayed torque step',
    scenario: {
      ...base,
      name: 'j',
      joint: { inertia: 1, damping: 0, stiffness: 0 },
      controller: { mode: 'pid', kp: 3.75, ki: 2, kd: 2.53125, derivativeFilter: 0.125 },
      inputs: [
        { channel: 'reference', shape: 'step', amplitude: 1 },
        { channel: 'torque', shape: 'step', amplitude: 0.5, delay: 2 },
      ],
    },
    until: 8,
  },
  {
    title: 'decay input whose rate equals a joint pole (input pole merges with a loop pole)',
    scenario: { ...base, name: 'k', joint: { inertia: 1, damping: 3, stiffness: 2 }, controller: { mode: 'open-loop' }, inputs: [{ channel: 'torque', shape: 'decay', amplitude: 1, rate: 1 }] },
    until: 6,
  },
  {
    title: 'PID with torque impulse and sine disturbance, derivative on measurement, filtered',
    scenario: {
      ...base,
      name: 'l',
      joint: { inertia: 0.2, damping: 0.05, stiffness: 0 },
      controller: { mode: 'pid', kp: 8, ki: 4, kd: 1, derivativeOn: 'measurement', derivativeFilter: 0.05 },
      initial: { angle: 0, velocity: 0.5 },
      inputs: [
        { channel: 'torque', shape: 'impulse', amplitude: 0.1, delay: 0.25 },
        { channel: 'torque', shape: 'sine', amplitude: 0.3, frequency: 3, delay: 0.5 },
      ],
    },
    until: 3,
  },
  {
    title: 'nearly repeated poles (critical damping perturbed by 1e-14)',
    scenario: { ...base, name: 'm', joint: { inertia: 1, damping: 4, stiffness: 4 * (1 - 1e-14) }, controller: { mode: 'open-loop' }, initial: { angle: 1, velocity: 0 }, inputs: [{ channel: 'torque', shape: 'step', amplitude: 1 }] },
    until: 5,
  },
  {
    title: 'PI loop without derivative, delayed reference pulse',
    scenario: {
      ...base,
      name: 'n',
      joint: { inertia: 0.5, damping: 1, stiffness: 0 },
      controller: { mode: 'pid', kp: 3, ki: 1.5 },
      inputs: [{ channel: 'reference', shape: 'pulse', amplitude: 0.4, delay: 0.2, width: 1 }],
    },
    until: 6,
  },
];
