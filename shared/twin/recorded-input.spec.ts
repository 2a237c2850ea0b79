import { describe, expect, it } from 'vitest';
import { responseAt, solveClosedForm } from '../closed-form';
import { parseScenario } from '../scenario/parse-scenario';
import type { InputTerm, RecordedInput, Scenario } from '../scenario/scenario-schema';
import { forcingTermsOf } from './forcing-terms';
import { recordedSamplesProblem, withRecordings, type RecordedSamples, type TwinScenario } from './recorded-samples';
import { buildScenario } from './testing/build-scenario';
import { createTwinRun, simulateTwin } from './twin-run';

const EPS = 1e-12;
const samples = (t: number[], values: number[]): RecordedSamples => ({ t: Float64Array.from(t), values: Float64Array.from(values) });

const term = (patch: Partial<RecordedInput> = {}): RecordedInput => ({ channel: 'torque', logId: 'log-1', signal: 'torque', hold: 'zoh', delay: 0, ...patch });

function recorded(base: Scenario, terms: RecordedInput[], signals: RecordedSamples[]): TwinScenario {
  const attached = withRecordings({ ...base, recordedInputs: terms }, (logId) => signals[Number(logId.split('-')[1]) - 1]);
  if (!attached.ok) throw new Error(JSON.stringify(attached.errors));
  return attached.value;
}

const openLoop = (inputs: InputTerm[] = [], horizon = 1.5) =>
  buildScenario({ joint: { inertia: 0.05, damping: 0.3, stiffness: 2 }, controller: { mode: 'open-loop' }, inputs, horizon });

/** Largest |twin − closed form| of the same joint, the closed form driven by `equivalent`. */
function worstAgainstClosedForm(twinScenario: TwinScenario, equivalent: InputTerm[]): number {
  const twin = simulateTwin(twinScenario);
  expect(twin.stop).toBeNull();
  const { recordings: _samples, ...plain } = twinScenario;
  const solved = solveClosedForm({ ...plain, recordedInputs: [], inputs: equivalent });
  if (!solved.ok) throw new Error(JSON.stringify(solved.errors));
  let worst = 0;
  const { t, angle } = twin.samples;
  for (let i = 0; i < t.length; i++) worst = Math.max(worst, Math.abs(angle[i]! - responseAt(solved.value.plan, t[i]!, 0)));
  return worst;
}

describe('recorded inputs in the scenario', () => {
  it('parses a reference to a log, with zero-order hold and no delay by default', () => {
    const parsed = parseScenario({ ...openLoop(), recordedInputs: [{ channel: 'torque', logId: ' 17 ', signal: 'torque' }] });
    expect(parsed.ok && parsed.value.recordedInputs).toEqual([{ channel: 'torque', logId: '17', signal: 'torque', hold: 'zoh', delay: 0 }]);
  });

  it('refuses a signal on the wrong channel, an unknown hold and a negative delay, naming each field', () => {
    const parsed = parseScenario({
      ...openLoop(),
      recordedInputs: [
        { channel: 'reference', logId: 'a', signal: 'torque' },
        { channel: 'torque', logId: 'a', signal: 'torque', hold: 'cubic' },
        { channel: 'torque', logId: 'a', signal: 'torque', delay: -0.1 },
      ],
    });
    expect(parsed).toEqual({
      ok: false,
      errors: [
        { field: 'recordedInputs.0.channel', message: 'a torque signal drives the torque channel' },
        { field: 'recordedInputs.1.hold', message: 'hold must be one of zoh, linear' },
        { field: 'recordedInputs.2.delay', message: 'delay must be zero or more' },
      ],
    });
  });

  it('refuses a recorded set-point in open loop', () => {
    const parsed = parseScenario({ ...openLoop(), recordedInputs: [{ channel: 'reference', logId: 'a', signal: 'setpoint' }] });
    expect(parsed).toEqual({ ok: false, errors: [{ field: 'recordedInputs.0.channel', message: 'a recorded set-point needs a closed loop (controller.mode "pid")' }] });
  });
});

describe('recorded samples', () => {
  it('refuses unequal lengths, no samples, non-finite values, times before 0 or not increasing, naming the sample', () => {
    expect(recordedSamplesProblem(samples([0, 1], [1]))).toBe('2 times but 1 values');
    expect(recordedSamplesProblem(samples([], []))).toBe('the signal has no samples');
    expect(recordedSamplesProblem(samples([0, 1, 1], [0, 0, 0]))).toBe('time of sample 2 (1 s) is not after the one before (1 s)');
    expect(recordedSamplesProblem(samples([0, Number.NaN], [0, 0]))).toBe('time of sample 1 is not a finite number');
    expect(recordedSamplesProblem(samples([-1, 0], [0, 0]))).toMatch(/^time of sample 0 \(-1 s\) is before/);
    expect(recordedSamplesProblem(samples([0, 1], [0, Infinity]))).toBe('value of sample 1: must be a finite number');
    expect(recordedSamplesProblem(samples([0, 1], [0, 2e9]))).toMatch(/^value of sample 1: must be at most 1e9/);
    expect(recordedSamplesProblem({ t: [0] as unknown as Float64Array, values: Float64Array.of(0) })).toMatch(/Float64Arrays/);
  });

  it('names the recorded input whose log or signal is missing or bad; the twin refuses one without its samples', () => {
    const base = { ...openLoop(), recordedInputs: [term(), term({ logId: 'log-2' })] };
    const attached = withRecordings(base, (id) => (id === 'log-1' ? samples([0, 0], [1, 1]) : undefined));
    expect(attached).toEqual({
      ok: false,
      errors: [
        { field: 'recordedInputs.0', message: 'log "log-1", torque: time of sample 1 (0 s) is not after the one before (0 s)' },
        { field: 'recordedInputs.1', message: 'log "log-2" has no torque signal' },
      ],
    });
    expect(() => simulateTwin(base)).toThrow(/recordedInputs.0.*were not given to the twin/);
  });
});

describe('recorded inputs as forcing terms', () => {
  const signal = samples([0.1, 0.3, 0.35, 0.6], [0.2, -0.1, -0.1, 0.05]);

  it('zero-order hold: 0 before the first sample, each value up to the next change, the last held; edges only where it changes', () => {
    const terms = forcingTermsOf(recorded(openLoop(), [term()], [signal]));
    expect(terms.breakpoints).toEqual([0, 0.1, 0.3, 0.6]);
    expect(terms.stretchFrom(0, EPS).torque(0.1)).toBe(0);
    expect(terms.stretchFrom(0.1, EPS).torque(0.3)).toBe(0.2);
    const middle = terms.stretchFrom(0.3, EPS);
    expect(middle.torque(0.6)).toBe(-0.1);
    expect(middle.torqueConstant).toBe(true);
    expect(terms.stretchFrom(0.6, EPS).torque(1.4)).toBe(0.05);
  });

  it('linear: the straight line between samples, edges at the first sample and where the slope changes, the last held', () => {
    const ramp = samples([0, 0.2, 0.4, 0.5], [0, 1, 2, 2]);
    const terms = forcingTermsOf(recorded(openLoop(), [term({ hold: 'linear' })], [ramp]));
    // 0.2 lies on the line from 0 to 0.4: no slope change there.
    expect(terms.breakpoints).toEqual([0, 0.4]);
    const first = terms.stretchFrom(0, EPS);
    expect(first.torque(0.3)).toBeCloseTo(1.5, 14);
    expect(first.torqueConstant).toBe(false);
    expect(terms.stretchFrom(0.4, EPS).torque(1)).toBe(2);
  });

  it('a delay shifts every sample; a set-point jumps at its edges, which the loop sees as reference jumps', () => {
    const pid = buildScenario({ inputs: [], horizon: 1 });
    const terms = forcingTermsOf(recorded(pid, [term({ channel: 'reference', signal: 'setpoint', delay: 0.05 })], [signal]));
    expect(terms.breakpoints).toEqual([0, 0.15000000000000002, 0.35, 0.65]);
    expect(terms.referenceJumpAt(0.35)).toBeCloseTo(-0.3, 15);
    expect(terms.referenceJumpAt(0.4)).toBe(0);
    expect(terms.stretchFrom(0.35, EPS).referenceRate(0.5)).toBe(0);
  });

  it('adds the torque offset of the nonlinear block throughout', () => {
    const terms = forcingTermsOf({ ...openLoop([{ channel: 'torque', shape: 'step', amplitude: 1, delay: 0.5 }]), nonlinear: { torqueOffset: 0.25 } });
    expect(terms.stretchFrom(0, EPS).torque(0.2)).toBe(0.25);
    expect(terms.stretchFrom(0.5, EPS).torque(0.7)).toBe(1.25);
  });

  // A zero-order-hold signal is a sum of steps and a linear one a sum of ramps, whose closed
  // forms are exact (superposition and the time-shift rule, common practice): the twin driven by
  // the samples must match them to integration accuracy, which it can only if it restarts at each edge.
  it('the twin under a zero-order-hold torque matches the closed form of the equivalent steps', () => {
    const equivalent: InputTerm[] = [
      { channel: 'torque', shape: 'step', amplitude: 0.2, delay: 0.1 },
      { channel: 'torque', shape: 'step', amplitude: -0.3, delay: 0.3 },
      { channel: 'torque', shape: 'step', amplitude: 0.15, delay: 0.6 },
    ];
    expect(worstAgainstClosedForm(recorded(openLoop(), [term()], [signal]), equivalent)).toBeLessThan(1e-9);
  });

  it('the twin under a linear torque matches the closed form of the equivalent ramps', () => {
    const ramp = samples([0.1, 0.4, 0.9], [0, 0.6, 0.1]);
    const equivalent: InputTerm[] = [
      { channel: 'torque', shape: 'ramp', amplitude: 2, delay: 0.1 },
      { channel: 'torque', shape: 'ramp', amplitude: -3, delay: 0.4 },
      { channel: 'torque', shape: 'ramp', amplitude: 1, delay: 0.9 },
    ];
    expect(worstAgainstClosedForm(recorded(openLoop(), [term({ hold: 'linear' })], [ramp]), equivalent)).toBeLessThan(1e-9);
  });

  it('the twin under a delayed zero-order-hold set-point in a PD loop matches the closed form of the equivalent steps', () => {
    const pid = buildScenario({ inputs: [], horizon: 1.5, controller: { mode: 'pid', kp: 8, kd: 0.6, derivativeOn: 'measurement' } });
    const equivalent: InputTerm[] = [
      { channel: 'reference', shape: 'step', amplitude: 0.2, delay: 0.15 },
      { channel: 'reference', shape: 'step', amplitude: -0.3, delay: 0.35 },
      { channel: 'reference', shape: 'step', amplitude: 0.15, delay: 0.65 },
    ];
    const scenario = recorded(pid, [term({ channel: 'reference', signal: 'setpoint', delay: 0.05 })], [signal]);
    expect(worstAgainstClosedForm(scenario, equivalent)).toBeLessThan(1e-9);
  });

  it('reuses one stretch object across recorded samples: nothing is allocated per edge', () => {
    const terms = forcingTermsOf(recorded(openLoop(), [term()], [signal]));
    const first = terms.stretchFrom(0.1, EPS);
    expect(terms.stretchFrom(0.3, EPS)).toBe(first);
    expect(first.torque(0.5)).toBe(-0.1);
  });

  it('a kick at a recorded set-point edge adds only its own jump (the edge was applied on arrival)', () => {
    // An unfiltered derivative on the error turns each reference jump into a velocity jump, so a
    // jump applied twice would show at once.
    const pid = buildScenario({ inputs: [], horizon: 1, controller: { mode: 'pid', kp: 8, kd: 0.6, derivativeOn: 'error' } });
    const scenario = recorded(pid, [term({ channel: 'reference', signal: 'setpoint' })], [signal]);
    const run = createTwinRun(scenario, { dt: 0.001 });
    const before = run.advance(0.3);
    const kicked = run.kick({ channel: 'torque', shape: 'step', amplitude: 0.1 });
    expect(kicked.ok && kicked.value.delay).toBe(0.3);
    const after = run.advance(1);
    const whole = simulateTwin({ ...scenario, inputs: [...run.inputs] }, { dt: 0.001 }).samples;
    const angle = [...before.angle, ...after.angle];
    for (let i = 301; i < angle.length; i++) expect(angle[i]).toBeCloseTo(whole.angle[i]!, 9);
  });

  it('the closed form says plainly that it leaves a recorded input out', () => {
    const solved = solveClosedForm({ ...openLoop(), recordedInputs: [term()] });
    expect(solved.ok && solved.value.notes.join(' ')).toMatch(/does not cover a recorded input \(torque of log "log-1"\)/);
  });
});
