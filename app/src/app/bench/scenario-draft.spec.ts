import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { fieldText, samePlainData } from './scenario-draft';

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

describe('fieldText', () => {
  it('show the edit when there is one, else the saved value', () => {
    expect(fieldText(saved, {}, 'joint.inertia')).toBe('0.01');
    expect(fieldText(saved, { 'joint.inertia': '0.0' }, 'joint.inertia')).toBe('0.0');
    expect(fieldText(saved, {}, 'controller.mode')).toBe('pid');
    expect(fieldText(saved, {}, 'inputs.0.width')).toBe('');
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
