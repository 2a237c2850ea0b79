import { describe, expect, it } from 'vitest';
import { PARAMETER_CATALOGUE } from '../scenario/parameter-catalogue';
import { withRecordings, type TwinScenario } from '../twin/recorded-samples';
import { buildScenario } from '../twin/testing/build-scenario';
import { FIT_PARAMETER_NAMES, FIT_PARAMETERS } from './fit-parameters';
import { applyFit, fitTwin } from './fit-twin';
import { staircaseSignal, synthesizeTrace } from './testing/synthetic-log';

const signal = staircaseSignal(1, 200, 0.1, 0.4, 5);

function scenarioWith(patch: Parameters<typeof buildScenario>[0]): TwinScenario {
  const attached = withRecordings(
    buildScenario({ controller: { mode: 'open-loop' }, inputs: [], horizon: 1, recordedInputs: [{ channel: 'torque', logId: 'l', signal: 'torque' }], ...patch }),
    () => signal,
  );
  if (!attached.ok) throw new Error(JSON.stringify(attached.errors));
  return attached.value;
}

const scenario = scenarioWith({ joint: { inertia: 0.05, damping: 0.3, stiffness: 2 } });
const measured = synthesizeTrace(scenario, 200, 1e-4, null, 3);

describe('the fit parameters', () => {
  it('are exactly the catalogue’s fittable entries, once each', () => {
    const paths = FIT_PARAMETER_NAMES.map((name) => FIT_PARAMETERS[name].entry.path).sort();
    expect(paths).toEqual(PARAMETER_CATALOGUE.filter((e) => e.fittable).map((e) => e.path).sort());
  });

  it('write into a copy of the scenario; static friction stays at least the Coulomb level', () => {
    const base = scenarioWith({ nonlinear: { coulombFriction: 0.1, staticFriction: 0.15 } });
    const applied = applyFit(base, { inertia: 0.2, coulombFriction: 0.2, inputDelay: 0.01 });
    expect(applied.joint.inertia).toBe(0.2);
    expect(applied.nonlinear).toMatchObject({ coulombFriction: 0.2, staticFriction: 0.2 });
    expect(applied.recordedInputs![0]!.delay).toBe(0.01);
    expect(base.joint.inertia).toBe(0.05);
    expect(FIT_PARAMETERS.staticFriction.set(base, 0.05).nonlinear.staticFriction).toBe(0.1);
  });
});

describe('a fit request', () => {
  const ask = (patch: object) => fitTwin({ scenario, measured, parameters: ['inertia'], ...patch });

  it('names unknown, repeated or impossible parameters', () => {
    expect(ask({ parameters: ['inertia', 'kp', 'inertia'] })).toEqual({
      ok: false,
      errors: [
        { field: 'parameters.1', message: expect.stringMatching(/^"kp" is not a fittable parameter \(one of inertia, damping/) },
        { field: 'parameters.2', message: '"inertia" is named twice' },
      ],
    });
    expect(ask({ parameters: [] })).toMatchObject({ ok: false, errors: [{ field: 'parameters' }] });
    const noRecording = fitTwin({ scenario: buildScenario({ controller: { mode: 'open-loop' }, inputs: [] }), measured, parameters: ['inputDelay'] });
    expect(noRecording).toMatchObject({ ok: false, errors: [{ field: 'parameters', message: expect.stringMatching(/recorded inputs, and the scenario has none/) }] });
  });

  it('names the sample of a bad trace and the problem with a window or bounds', () => {
    const t = measured.t.slice();
    t[7] = t[6]!;
    expect(ask({ measured: { ...measured, t } })).toMatchObject({ ok: false, errors: [{ field: 'measured.t', message: expect.stringMatching(/^time of sample 7 .* is not after the one before/) }] });
    const angle = measured.angle.slice();
    angle[3] = Number.NaN;
    expect(ask({ measured: { ...measured, angle } })).toMatchObject({ ok: false, errors: [{ field: 'measured.angle', message: 'angle of sample 3 is not a finite number' }] });
    expect(ask({ measured: { ...measured, velocity: new Float64Array(3) } })).toMatchObject({ ok: false, errors: [{ field: 'measured.velocity', message: expect.stringMatching(/has 3 samples but time has 201/) }] });
    expect(ask({ window: { start: 0.5, end: 0.505 } })).toMatchObject({ ok: false, errors: [{ field: 'window', message: expect.stringMatching(/holds 2 measured samples; fitting 1 parameters needs at least 4/) }] });
    expect(ask({ window: { start: 0.5, end: 0.2 } })).toMatchObject({ ok: false, errors: [{ field: 'window' }] });
    expect(ask({ bounds: { inertia: { min: 0.1 } } })).toMatchObject({ ok: false, errors: [{ field: 'bounds.inertia', message: expect.stringMatching(/start and lies outside its bounds/) }] });
    expect(ask({ bounds: { inertia: { max: 1e9 } } })).toMatchObject({ ok: false, errors: [{ field: 'bounds.inertia.max', message: expect.stringMatching(/^inertia must be at most 1e6/) }] });
    expect(ask({ maxIterations: 0 })).toMatchObject({ ok: false, errors: [{ field: 'maxIterations' }] });
  });
});

describe('the fit report', () => {
  it('fits only inside the window and reports the residual series there', () => {
    const report = fitTwin({ scenario, measured, parameters: ['damping'], window: { start: 0.25, end: 0.75 }, initialState: 'scenario' });
    if (!report.ok) throw new Error(JSON.stringify(report.errors));
    const { residuals } = report.value;
    expect(residuals.t[0]).toBeGreaterThanOrEqual(0.25);
    expect(residuals.t[residuals.t.length - 1]).toBeLessThanOrEqual(0.75);
    expect(report.value.degreesOfFreedom).toBe(residuals.t.length - 1);
    expect(report.value.intervalMethod).toMatch(/Student's t/);
  });

  it('warns, naming the pair, when the data cannot tell two parameters apart', () => {
    // A free joint (no damping, no spring) under torque moves as (τ + τ0)/J: inertia and offset act
    // only through one ratio once the torque is constant, so the pair is all but inseparable.
    const free = scenarioWith({ joint: { inertia: 0.05, damping: 0, stiffness: 0 }, recordedInputs: [{ channel: 'torque', logId: 'l', signal: 'torque' }] });
    const step = withRecordings(free, () => ({ t: Float64Array.of(0), values: Float64Array.of(0.2) }));
    if (!step.ok) throw new Error('bad step');
    const trace = synthesizeTrace(step.value, 200, 1e-4, null, 4);
    const start = { ...step.value, joint: { ...step.value.joint, inertia: 0.06 }, nonlinear: { torqueOffset: 0.01 } };
    const report = fitTwin({ scenario: start, measured: trace, parameters: ['inertia', 'torqueOffset'], initialState: 'scenario' });
    if (!report.ok) throw new Error(JSON.stringify(report.errors));
    expect(report.value.warnings.join('\n')).toMatch(/inertia and torqueOffset are correlated|cannot separate inertia, torqueOffset/);
  });

  it('reports progress after each iteration and stops when cancelled', () => {
    const seen: number[] = [];
    const start = { ...scenario, joint: { ...scenario.joint, inertia: 0.08 } };
    const done = fitTwin({ scenario: start, measured, parameters: ['inertia'], initialState: 'scenario' }, { onProgress: ({ iteration }) => seen.push(iteration) });
    expect(done.ok).toBe(true);
    expect(seen.slice(0, 3)).toEqual([0, 1, 2]);
    let calls = 0;
    const cancelled = fitTwin({ scenario: start, measured, parameters: ['inertia'] }, { onProgress: () => calls++, isCancelled: () => calls > 1 });
    expect(cancelled).toEqual({ ok: false, cancelled: true, errors: [{ field: '', message: 'the fit was cancelled' }] });
  });

  it('numbers the iterations of the velocity-weighted second pass on from the first', () => {
    const withVelocity = synthesizeTrace(scenario, 200, 1e-4, 1e-3, 5);
    const seen: number[] = [];
    const start = { ...scenario, joint: { ...scenario.joint, inertia: 0.08 } };
    const done = fitTwin({ scenario: start, measured: withVelocity, parameters: ['inertia'], initialState: 'scenario' }, { onProgress: ({ iteration }) => seen.push(iteration) });
    if (!done.ok) throw new Error(JSON.stringify(done.errors));
    expect(seen).toEqual([...seen].sort((a, b) => a - b));
    expect(seen[seen.length - 1]).toBe(done.value.iterations);
    expect(done.value.velocity!.rms).toBeGreaterThan(0.5e-3);
  });

  it('says when the twin cannot run at the start values', () => {
    // A spring pushing away from rest hard enough that the twin's runaway bound stops the run.
    const runaway = { ...scenario, joint: { ...scenario.joint, stiffness: -1e6 } };
    const report = fitTwin({ scenario: runaway, measured, parameters: ['stiffness'] });
    expect(report).toMatchObject({ ok: false, errors: [{ field: 'parameters', message: expect.stringMatching(/^the model cannot be evaluated at the starting values: /) }] });
  });
});
