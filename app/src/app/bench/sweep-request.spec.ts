import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { sweepDefaultsOf, sweepPlanOf } from './sweep-request';

// Demo data (invented numbers): the wrist demo, and an open-loop joint pushed by a torque step.
function scenario(mode: 'pid' | 'open-loop', inputs: unknown[]): Scenario {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Wrist pitch',
    joint: { inertia: 0.012, damping: 0.04, stiffness: mode === 'pid' ? 0 : 2 },
    controller: mode === 'pid' ? { mode, kp: 6, ki: 1, kd: 0.4, derivativeOn: 'measurement' } : { mode },
    inputs,
    horizon: 2,
  });
  if (!parsed.ok) throw new Error(`fixture invalid: ${JSON.stringify(parsed.errors)}`);
  return parsed.value;
}

const wrist = () =>
  scenario('pid', [
    { channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 },
    { channel: 'reference', shape: 'sine', amplitude: -0.7, frequency: 3, delay: 0 },
    { channel: 'reference', shape: 'ramp', amplitude: 9, delay: 0 },
    { channel: 'torque', shape: 'impulse', amplitude: 4, delay: 0 },
  ]);
const grid = { from: 0.1, to: 1000, points: 200 };

describe('sweepDefaultsOf', () => {
  it('names the reference in closed loop and the largest |amplitude| of its steps and sines, ramps and impulses left out', () => {
    const d = sweepDefaultsOf(wrist(), 'default');
    expect(d).toEqual({ channel: 'reference', amplitude: 0.7, channelText: 'reference (closed loop)', amplitudeText: "0.7 rad, the largest of the scenario's reference terms" });
  });

  it('falls back to 1 on a channel with no term to take it from, and names the torque in open loop', () => {
    expect(sweepDefaultsOf(wrist(), 'torque')).toMatchObject({ channel: 'torque', amplitude: 1, amplitudeText: '1 N·m: the scenario has no torque term to take it from' });
    const open = scenario('open-loop', [{ channel: 'torque', shape: 'step', amplitude: 2.5, delay: 0 }]);
    expect(sweepDefaultsOf(open, 'default')).toMatchObject({ channel: 'torque', amplitude: 2.5, channelText: 'torque (open loop)' });
  });
});

describe('sweepPlanOf', () => {
  it('sends the panel grid capped at 40 points and leaves the defaults to the server', () => {
    const plan = sweepPlanOf(wrist(), grid, 'default', '  ');
    if (!plan.ok) throw new Error('refused');
    expect(plan.value.body).toEqual({ scenario: wrist(), from: 0.1, to: 1000, points: 40 });
    expect('channel' in plan.value.body || 'amplitude' in plan.value.body).toBe(false);
    expect(plan.value).toMatchObject({ channel: 'reference', amplitude: 0.7, grid: { from: 0.1, to: 1000, points: 40 }, capped: true });
  });

  it('keeps a grid within the cap as it is, and sends a chosen channel and amplitude', () => {
    const plan = sweepPlanOf(wrist(), { from: 1, to: 100, points: 12 }, 'torque', '0.25');
    if (!plan.ok) throw new Error('refused');
    expect(plan.value.body).toMatchObject({ from: 1, to: 100, points: 12, channel: 'torque', amplitude: 0.25 });
    expect(plan.value.capped).toBe(false);
  });

  it('refuses an amplitude that is not a positive number up to 1e9, and a reference sweep in open loop, naming the field', () => {
    const errorsOf = (s: Scenario, channel: 'default' | 'reference' | 'torque', amplitude: string) => {
      const plan = sweepPlanOf(s, grid, channel, amplitude);
      return plan.ok ? [] : plan.errors;
    };
    expect(errorsOf(wrist(), 'default', 'half')).toEqual([{ field: 'amplitude', message: 'must be a number, got "half"' }]);
    expect(errorsOf(wrist(), 'default', '0')).toEqual([{ field: 'amplitude', message: 'must be positive' }]);
    expect(errorsOf(wrist(), 'default', '-1')).toEqual([{ field: 'amplitude', message: 'must be positive' }]);
    expect(errorsOf(wrist(), 'default', '2e9')).toEqual([{ field: 'amplitude', message: 'must be at most 1000000000' }]);
    const open = scenario('open-loop', []);
    expect(errorsOf(open, 'reference', '')).toEqual([{ field: 'channel', message: 'an open loop has no reference: measure the torque channel' }]);
    expect(errorsOf(open, 'default', '')).toEqual([]);
  });
});
