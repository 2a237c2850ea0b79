import { describe, expect, it } from 'vitest';
import type { ScenarioInput } from '../scenario/scenario-schema';
import { withRecordings, type RecordedSamples, type TwinScenario } from '../twin/recorded-samples';
import { buildScenario } from '../twin/testing/build-scenario';
import type { FitParameterName } from './fit-parameters';
import { fitTwin, type FitReport } from './fit-twin';
import { staircaseSignal, synthesizeTrace } from './testing/synthetic-log';

/**
 * Recovery: logs synthesized by the twin from known parameters, with seeded Gaussian noise on the
 * measured angle (common practice for checking an estimator), fitted from a start well off the
 * truth. Each true value must lie inside its stated 95 % interval, and each interval must be
 * narrow enough to mean something — so a fit that lands elsewhere, or claims too little, fails.
 */

function twinScenario(patch: Partial<ScenarioInput>, signal: RecordedSamples): TwinScenario {
  const attached = withRecordings(buildScenario(patch), () => signal);
  if (!attached.ok) throw new Error(JSON.stringify(attached.errors));
  return attached.value;
}

function expectRecovered(report: FitReport, truth: Partial<Record<FitParameterName, number>>, widest: number) {
  expect(report.status).toBe('converged');
  for (const p of report.parameters) {
    const true_ = truth[p.name]!;
    expect(p.low, p.name).not.toBeNull();
    expect(p.low!, `${p.name}: ${p.low} to ${p.high} should hold ${true_}`).toBeLessThanOrEqual(true_);
    expect(p.high!, `${p.name}: ${p.low} to ${p.high} should hold ${true_}`).toBeGreaterThanOrEqual(true_);
    expect((p.high! - p.low!) / Math.abs(true_), `${p.name} interval width`).toBeLessThan(widest);
  }
}

const torqueLog = (logId = 'bench-log') => [{ channel: 'torque' as const, logId, signal: 'torque' as const }];
const noise = 2e-4;

describe('fitting the twin back to its own logs', () => {
  it('open loop under a logged torque: inertia, damping and stiffness', () => {
    const signal = staircaseSignal(4, 500, 0.1, 0.4, 5);
    const truth = { inertia: 0.05, damping: 0.3, stiffness: 2 };
    const scenario = twinScenario({ joint: truth, controller: { mode: 'open-loop' }, inputs: [], horizon: 4, recordedInputs: torqueLog() }, signal);
    const measured = synthesizeTrace(scenario, 500, noise, null, 11);
    const start = { ...scenario, joint: { ...scenario.joint, inertia: 0.08, damping: 0.15, stiffness: 3 } };
    const report = fitTwin({ scenario: start, measured, parameters: ['inertia', 'damping', 'stiffness'], initialState: 'scenario' });
    if (!report.ok) throw new Error(JSON.stringify(report.errors));
    expectRecovered(report.value, truth, 0.02);
    expect(report.value.warnings).toEqual([]);
    // The residuals are the noise: their RMS is σ to within a few per cent (n = 2001).
    expect(report.value.angle.rms / noise).toBeGreaterThan(0.9);
    expect(report.value.angle.rms / noise).toBeLessThan(1.1);
    expect(report.value.residuals.angle.length).toBe(measured.t.length);
  });

  it('a closed PD loop under logged set-point steps, with velocity measured too', () => {
    const signal = staircaseSignal(3, 500, 0.5, 0.6, 8);
    const truth = { inertia: 0.04, damping: 0.05, stiffness: 0.5 };
    const scenario = twinScenario(
      {
        joint: truth,
        controller: { mode: 'pid', kp: 6, kd: 0.3, derivativeOn: 'measurement' },
        inputs: [],
        horizon: 3,
        recordedInputs: [{ channel: 'reference', logId: 'pd-log', signal: 'setpoint' }],
      },
      signal,
    );
    const measured = synthesizeTrace(scenario, 500, noise, 5e-3, 12);
    const start = { ...scenario, joint: { ...scenario.joint, inertia: 0.06, damping: 0.1, stiffness: 0.3 } };
    const report = fitTwin({ scenario: start, measured, parameters: ['inertia', 'damping', 'stiffness'], initialState: 'scenario' });
    if (!report.ok) throw new Error(JSON.stringify(report.errors));
    expectRecovered(report.value, truth, 0.2);
    expect(report.value.velocity).not.toBeNull();
    // Velocity residuals weighed by their own noise: their RMS is that noise.
    expect(report.value.velocity!.rms / 5e-3).toBeGreaterThan(0.9);
    expect(report.value.velocity!.rms / 5e-3).toBeLessThan(1.1);
  });

  it('with Coulomb friction: inertia, damping and the friction level', () => {
    const signal = staircaseSignal(3, 500, 0.25, 0.5, 21);
    const truth = { inertia: 0.03, damping: 0.1, coulombFriction: 0.06 };
    const scenario = twinScenario(
      { joint: { inertia: 0.03, damping: 0.1, stiffness: 0 }, controller: { mode: 'open-loop' }, inputs: [], horizon: 3, recordedInputs: torqueLog(), nonlinear: { coulombFriction: 0.06 } },
      signal,
    );
    const measured = synthesizeTrace(scenario, 500, noise, null, 13);
    const start = { ...scenario, joint: { ...scenario.joint, inertia: 0.04, damping: 0.15 }, nonlinear: { coulombFriction: 0.03 } };
    const report = fitTwin({ scenario: start, measured, parameters: ['inertia', 'damping', 'coulombFriction'], initialState: 'scenario' });
    if (!report.ok) throw new Error(JSON.stringify(report.errors));
    expectRecovered(report.value, truth, 0.1);
  });

  it('finds a dead time between the logged torque and the joint, and a torque offset', () => {
    const signal = staircaseSignal(3, 500, 0.1, 0.4, 5);
    const truth = { inertia: 0.05, damping: 0.3, inputDelay: 0.0123, torqueOffset: 0.05 };
    const scenario = twinScenario(
      {
        joint: { inertia: 0.05, damping: 0.3, stiffness: 2 },
        controller: { mode: 'open-loop' },
        inputs: [],
        horizon: 3,
        recordedInputs: [{ channel: 'torque', logId: 'l', signal: 'torque', delay: 0.0123 }],
        nonlinear: { torqueOffset: 0.05 },
      },
      signal,
    );
    const measured = synthesizeTrace(scenario, 500, noise, null, 14);
    const start = { ...scenario, joint: { ...scenario.joint, inertia: 0.06, damping: 0.25 }, recordedInputs: [{ ...scenario.recordedInputs![0]!, delay: 0.005 }], nonlinear: { torqueOffset: 0.02 } };
    const report = fitTwin({ scenario: start, measured, parameters: ['inertia', 'damping', 'inputDelay', 'torqueOffset'], initialState: 'scenario' });
    if (!report.ok) throw new Error(JSON.stringify(report.errors));
    expectRecovered(report.value, truth, 0.1);
  });
});
