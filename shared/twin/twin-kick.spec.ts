import { describe, expect, it } from 'vitest';
import { buildScenario } from './testing/build-scenario';
import { createTwinRun, simulateTwin } from './twin-run';

describe('kicks: forcing terms added to a live run', () => {
  const base = buildScenario({ controller: { mode: 'pid', kp: 8, ki: 2, kd: 0.6, derivativeOn: 'error' }, horizon: 2 });

  it('gives the same run as a scenario that carried the term from the start', () => {
    const run = createTwinRun(base, { dt: 0.001 });
    const first = run.advance(0.7);
    const added = run.kick({ channel: 'torque', shape: 'impulse', amplitude: 0.02 });
    if (!added.ok) throw new Error(JSON.stringify(added.errors));
    expect(added.value.delay).toBe(run.time);
    const reference = run.kick({ channel: 'reference', shape: 'step', amplitude: -0.2, delay: 1.1 });
    expect(reference.ok).toBe(true);
    const rest = run.advance(2);
    expect(run.inputs).toHaveLength(3);
    const whole = simulateTwin({ ...base, inputs: [...run.inputs] }, { dt: 0.001 }).samples;
    const angle = [...first.angle, ...rest.angle];
    expect(angle).toHaveLength(whole.angle.length);
    // Samples after the kick time agree; the one at the kick instant itself was sent before it.
    const from = Math.round(added.value.delay / 0.001) + 1;
    for (let i = from; i < angle.length; i++) expect(angle[i]).toBeCloseTo(whole.angle[i]!, 9);
  });

  it('refuses a kick in the past, on a finished run, of the wrong channel or with bad numbers', () => {
    // Stretches of 0.25 s: advancing to 0.5 s ends exactly there.
    const run = createTwinRun(base, { dt: 0.01, maxChunk: 0.25 });
    run.advance(0.5);
    const past = run.kick({ channel: 'torque', shape: 'step', amplitude: 1, delay: 0.2 });
    expect(past).toEqual({ ok: false, errors: [{ field: 'delay', message: expect.stringMatching(/cannot start at t = 0.2 s: the run is already at t = 0.5/) }] });
    const nan = run.kick({ channel: 'torque', shape: 'step', amplitude: Number.NaN });
    expect(nan.ok || nan.errors[0]!.field).toBe('amplitude');
    const late = run.kick({ channel: 'torque', shape: 'step', amplitude: 1, delay: 5 });
    expect(late.ok || late.errors[0]!.field).toBe('delay');
    const open = createTwinRun(buildScenario({ controller: { mode: 'open-loop' }, inputs: [] }), { dt: 0.01 });
    const wrong = open.kick({ channel: 'reference', shape: 'step', amplitude: 1 });
    expect(wrong.ok || wrong.errors[0]!.field).toBe('channel');
    run.advance(2);
    const ended = run.kick({ channel: 'torque', shape: 'step', amplitude: 1 });
    expect(ended.ok || ended.errors[0]!.message).toMatch(/run has ended/);
  });
});
