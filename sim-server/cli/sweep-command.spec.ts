import { describe, expect, it } from 'vitest';
import { parseCliArguments } from './cli-arguments';
import { runCli } from './run-cli';
import { memoryIo } from './testing/memory-io';

// A PD loop with the derivative on the measured angle: J s² + (b + kd) s + kp, ζ = (b + kd)/(2√(J kp)).
const joint = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'sweep joint',
  joint: { inertia: 0.02, damping: 0.05, stiffness: 0 },
  controller: { mode: 'pid', kp: 1, kd: 0.1, derivativeOn: 'measurement' },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 }],
  horizon: 4,
  limits: { overshootPercent: 10, settlingTime: 1, steadyStateError: null },
};
const files = {
  'joint.json': JSON.stringify(joint),
  'strict.json': JSON.stringify({ ...joint, limits: { overshootPercent: 0.001, settlingTime: 0.01, steadyStateError: null } }),
  'free.json': JSON.stringify({ ...joint, limits: { overshootPercent: null, settlingTime: null, steadyStateError: null } }),
  'open.json': JSON.stringify({ ...joint, controller: { mode: 'open-loop' }, inputs: [] }),
  'limited.json': JSON.stringify({ ...joint, horizon: 3, nonlinear: { torqueLimit: 1 } }),
};

describe('kinetwin sweep arguments', () => {
  it('parses the axes, the fixed gain, log spacing and the defaults', () => {
    expect(parseCliArguments(['sweep', 'a.json', '--x', 'kp:0:50:40', '--y', 'kd:0.01:5:40', '--z', 'ki:2', '--log', 'y'])).toEqual({
      ok: true,
      value: {
        command: 'sweep',
        file: 'a.json',
        request: { x: { gain: 'kp', min: 0, max: 50, count: 40, spacing: 'linear' }, y: { gain: 'kd', min: 0.01, max: 5, count: 40, spacing: 'log' }, z: { gain: 'ki', value: 2 } },
        method: 'closed-form',
        format: 'json',
      },
    });
    expect(parseCliArguments(['sweep', 'a.json', '--x', 'kp:1:50:4', '--y', 'kd:1:5:4', '--log', 'x', '--log', 'y', '--method', 'sim', '--format', 'csv'])).toMatchObject({
      ok: true,
      value: { request: { x: { spacing: 'log' }, y: { spacing: 'log' }, z: null }, method: 'sim', format: 'csv' },
    });
  });

  it.each([
    [['sweep', 'a.json', '--y', 'kd:0:5:40'], '--x', 'needs --x'],
    [['sweep', 'a.json', '--x', 'kp:0:50', '--y', 'kd:0:5:40'], '--x', 'GAIN:MIN:MAX:COUNT'],
    [['sweep', 'a.json', '--x', 'kp::50:40', '--y', 'kd:0:5:40'], '--x', 'GAIN:MIN:MAX:COUNT'],
    [['sweep', 'a.json', '--x', 'kq:0:50:40', '--y', 'kd:0:5:40'], '--x', 'one of kp, ki, kd'],
    [['sweep', 'a.json', '--x', 'kp:0:abc:40', '--y', 'kd:0:5:40'], '--x', 'finite MIN and MAX'],
    [['sweep', 'a.json', '--x', 'kp:0:50:4.5', '--y', 'kd:0:5:40'], '--x', 'whole COUNT'],
    [['sweep', 'a.json', '--x', 'kp:0:50:40', '--y', 'kd:0:5:40', '--z', 'ki'], '--z', 'GAIN:VALUE'],
    [['sweep', 'a.json', '--x', 'kp:0:50:40', '--y', 'kd:0:5:40', '--log', 'z'], '--log', 'x or y'],
    [['sweep', 'a.json', '--x', 'kp:0:50:40', '--y', 'kd:0:5:40', '--method', 'both'], '--method', 'closed-form or sim'],
    [['sweep', 'a.json', '--x', 'kp:0:50:40', '--y', 'kd:0:5:40', '--dt', '0.1'], '--dt', 'belongs to "response"'],
    [['response', 'a.json', '--x', 'kp:0:50:40'], '--x', 'belongs to "sweep"'],
  ])('refuses %j naming %s', (argv, field, reason) => {
    const parsed = parseCliArguments(argv);
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    expect(parsed.errors[0]!.field).toBe(field);
    expect(parsed.errors[0]!.message).toContain(reason);
  });
});

describe('kinetwin sweep', () => {
  it('prints the axes, one matrix per metric (rows along y) and the suggested cell as JSON', async () => {
    const m = memoryIo(files);
    expect(await runCli(['sweep', 'joint.json', '--x', 'kp:1:9:3', '--y', 'kd:0.01:1:4', '--log', 'y'], m.io)).toBe(0);
    const doc = JSON.parse(m.out());
    expect(Object.keys(doc)).toEqual(['scenario', 'method', 'axes', 'units', 'metrics', 'limits', 'meetsLimits', 'margin', 'contours', 'suggested', 'statement', 'reasons', 'safety']);
    expect(doc.axes.x).toMatchObject({ gain: 'kp', unit: 'N·m/rad', spacing: 'linear', values: [1, 5, 9] });
    expect(doc.axes.y.values).toHaveLength(4);
    expect(doc.axes.y.spacing).toBe('log');
    expect(Object.keys(doc.metrics)).toEqual(['overshootPercent', 'settlingTime', 'steadyStateError', 'slowestPoleReal', 'stable']);
    for (const matrix of Object.values(doc.metrics) as unknown[][][]) {
      expect(matrix).toHaveLength(4);
      for (const row of matrix) expect(row).toHaveLength(3);
    }
    // Row 3 is kd = 1, column 0 is kp = 1: ζ = 1.05/(2√0.02) ≈ 3.7, no overshoot.
    expect(doc.metrics.overshootPercent[3][0]).toBe(0);
    // Row 0 is kd = 0.01, column 2 is kp = 9: ζ ≈ 0.07, the textbook overshoot (Ogata §5-3, from memory).
    const zeta = 0.06 / (2 * Math.sqrt(0.02 * 9));
    expect(doc.metrics.overshootPercent[0][2]).toBeCloseTo(100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta)), 6);
    expect(doc.suggested).toMatchObject({ gains: { kp: expect.any(Number), kd: expect.any(Number) } });
    expect(doc.meetsLimits[doc.suggested.row][doc.suggested.col]).toBe(true);
    expect(doc.statement).toContain('meets every limit with a margin of');
    expect(doc.contours.map((c: { metric: string; level: number }) => [c.metric, c.level])).toEqual([
      ['overshootPercent', 10],
      ['settlingTime', 1],
    ]);
    expect(doc.safety).toContain('ISO 10218');
    expect(m.out()).not.toContain('NaN');
  });

  it('prints one CSV row per cell with a header naming units, and the statement on stderr', async () => {
    const m = memoryIo(files);
    expect(await runCli(['sweep', 'joint.json', '--x', 'kp:0:9:4', '--y', 'kd:0:1:2', '--z', 'ki:0', '--format', 'csv'], m.io)).toBe(0);
    const rows = m.out().trim().split('\n');
    expect(rows[0]).toBe('row,col,kp [N·m/rad],kd [N·m·s/rad],ki [N·m/(rad·s)],overshootPercent [%],settlingTime [s],steadyStateError [rad],slowestPoleReal [1/s],stable,meetsLimits,margin,reason');
    expect(rows).toHaveLength(9);
    // kp = ki = 0 with the derivative on the measurement: nothing carries the reference to the
    // joint, which stays put (error 0.5 rad) on a marginal loop (a pole at the origin).
    expect(rows[1]).toBe('0,0,0,0,0,,,0.5,0,false,false,,the step response settles at zero: relative metrics are undefined');
    expect(rows[2]).toMatch(/^0,1,3,0,0,\d/);
    expect(m.err()).toMatch(/^kinetwin: .* meets every limit .*not a safety validation/);
  });

  it('exits 1 when the scenario sets limits and no cell meets them, 0 when it sets none', async () => {
    const strict = memoryIo(files);
    expect(await runCli(['sweep', 'strict.json', '--x', 'kp:1:9:3', '--y', 'kd:0.01:1:2'], strict.io)).toBe(1);
    expect(JSON.parse(strict.out())).toMatchObject({ suggested: null, statement: 'no cell of the map meets every limit' });
    const free = memoryIo(files);
    expect(await runCli(['sweep', 'free.json', '--x', 'kp:1:9:3', '--y', 'kd:0.01:1:2'], free.io)).toBe(0);
    expect(JSON.parse(free.out()).statement).toContain('sets no limits');
  });

  it('with --method sim adds the superposition check, which the torque limit breaks at high gain', async () => {
    const m = memoryIo(files);
    expect(await runCli(['sweep', 'limited.json', '--x', 'kp:0.5:8:2', '--y', 'kd:0.2:0.4:2', '--method', 'sim'], m.io)).toBe(0);
    const doc = JSON.parse(m.out());
    expect(doc.method).toBe('sim');
    // kp·A = 0.25 N·m (α·u1: 0.5) stays under the 1 N·m limit; 4 N·m does not.
    expect(doc.metrics.superpositionPass).toEqual([
      [true, false],
      [true, false],
    ]);
    // kp = 0.5, kd = 0.4 is overdamped with a pole at −1.2 /s: still 3 % away at the 3 s horizon,
    // so the trace cannot show it settled (null); the closed form would call it stable.
    expect(doc.metrics.stable).toEqual([
      [true, true],
      [null, true],
    ]);
    expect(doc.reasons[1][0]).toContain('not settled by the horizon');
  });

  it.each([
    [['sweep', 'joint.json', '--x', 'kp:-1:9:3', '--y', 'kd:0:1:2'], '"--x": x.min: kp must be zero or more'],
    [['sweep', 'joint.json', '--x', 'kp:0:9:300', '--y', 'kd:0:1:2'], '"--x": x.count: count must be at most 200'],
    [['sweep', 'joint.json', '--x', 'kp:0:9:3', '--y', 'kd:0:1:2', '--log', 'y'], '"--y": y.min: a log axis needs min above zero'],
    [['sweep', 'joint.json', '--x', 'kp:0:9:3', '--y', 'kp:0:1:2'], '"--y": y.gain: x and y both sweep kp'],
    [['sweep', 'joint.json', '--x', 'kp:0:9:3', '--y', 'kd:0:1:2', '--z', 'kd:1'], '"--z"'],
    [['sweep', 'open.json', '--x', 'kp:0:9:3', '--y', 'kd:0:1:2'], '"controller.mode"'],
    [['sweep', 'nowhere.json', '--x', 'kp:0:9:3', '--y', 'kd:0:1:2'], '"FILE"'],
  ])('exits 2 for %j, naming the argument', async (argv, expected) => {
    const m = memoryIo(files);
    expect(await runCli(argv, m.io)).toBe(2);
    expect(m.err()).toContain(expected);
    expect(m.out()).toBe('');
  });
});
