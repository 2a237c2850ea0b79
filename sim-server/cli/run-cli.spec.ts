import { describe, expect, it } from 'vitest';
import { runCli } from './run-cli';
import { memoryIo } from './testing/memory-io';

// The whole command flow in-process, with files and streams replaced by memory.
const scenario = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'in-process joint',
  joint: { inertia: 1, damping: 0.5, stiffness: 2 },
  controller: { mode: 'open-loop' },
  inputs: [{ channel: 'torque', shape: 'step', amplitude: 1 }],
  horizon: 2,
};

const files = {
  'ok.json': JSON.stringify(scenario),
  'broken.json': '{ "kind": ',
  'unstable.json': JSON.stringify({
    ...scenario,
    joint: { inertia: 1, damping: 0, stiffness: 0 },
    controller: { mode: 'pid', kp: 1, ki: 10 },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }],
    limits: { overshootPercent: 10, settlingTime: null, steadyStateError: null },
  }),
  'overflow.json': JSON.stringify({ ...scenario, joint: { inertia: 1, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kp: 1, ki: 10 }, initial: { angle: 0.1, velocity: 0 }, inputs: [], horizon: 3600 }),
  'limited.json': JSON.stringify({
    ...scenario,
    controller: { mode: 'pid', kp: 20, kd: 4 },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }],
    nonlinear: { torqueLimit: 2 },
  }),
  // In every catalogued range, yet a grind for the twin (largest kd, 1 g·m², 1 µs loop, friction).
  'grind.json': JSON.stringify({
    ...scenario,
    joint: { inertia: 1e-3, damping: 0.08, stiffness: 0 },
    controller: { mode: 'pid', kp: 10, ki: 2, kd: 1e7, derivativeOn: 'measurement', samplePeriod: 1e-6 },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.8, delay: 0.2 }],
    horizon: 3,
    nonlinear: { torqueLimit: 1.5, coulombFriction: 0.05, staticFriction: 0.08 },
  }),
  'encoder-continuous.json': JSON.stringify({ ...scenario, controller: { mode: 'pid', kp: 2 }, inputs: [], nonlinear: { encoderCounts: 1024 } }),
  // s³ + s + 10 = (s + 2)(s² − 2s + 5): poles −2 and 1 ± 2i, so the angle grows like e^t.
  'runaway.json': JSON.stringify({ ...scenario, joint: { inertia: 1, damping: 0, stiffness: 0 }, controller: { mode: 'pid', kp: 1, ki: 10 }, initial: { angle: 0.1, velocity: 0 }, inputs: [], horizon: 100 }),
  'nolimits.json': JSON.stringify({ ...scenario, inputs: [{ channel: 'torque', shape: 'sine', amplitude: 1, frequency: 1 }] }),
};

describe('runCli', () => {
  it('prints the usage for help and exits 0', async () => {
    const m = memoryIo(files);
    expect(await runCli(['--help'], m.io)).toBe(0);
    expect(m.out()).toContain('kinetwin response FILE');
  });

  it.each([
    [['response', 'broken.json'], 'not valid JSON'],
    [['response', 'nowhere.json'], '"FILE": ENOENT'],
    [['response', 'ok.json', '--format', 'xml'], '"--format"'],
    [['response', 'ok.json', '--dt', '1e-9'], '"--dt"'],
    [['check', 'overflow.json'], '"horizon"'],
    [[], '"command"'],
    [['response', 'ok.json', '--method', 'guess'], '"--method"'],
    [['check', 'ok.json', '--method', 'sim'], '"--method"'],
    [['response', 'encoder-continuous.json', '--method', 'sim'], '"nonlinear.encoderCounts"'],
  ])('exits 2 for %j, naming the field', async (argv, expected) => {
    const m = memoryIo(files);
    expect(await runCli(argv, m.io)).toBe(2);
    expect(m.err()).toContain(expected);
  });

  it('check exits 1 for an unstable loop with a limit: metrics undefined, no final value', async () => {
    const m = memoryIo(files);
    expect(await runCli(['check', 'unstable.json'], m.io)).toBe(1);
    const doc = JSON.parse(m.out());
    expect(doc.finalValue).toMatchObject({ applies: false, value: null });
    expect(doc.metrics.overshootPercent).toBeNull();
    expect(doc.stable).toBe(false);
  });

  it('check exits 0 when the scenario sets no limits, even with no final value', async () => {
    const m = memoryIo(files);
    expect(await runCli(['check', 'nolimits.json'], m.io)).toBe(0);
    expect(JSON.parse(m.out()).finalValue.applies).toBe(false);
  });

  it('streams a long CSV in chunks that join into one row per grid point', async () => {
    const m = memoryIo(files);
    expect(await runCli(['response', 'ok.json', '--dt', '0.0001'], m.io)).toBe(0);
    const lines = m.out().trim().split('\n');
    expect(lines).toHaveLength(20002);
    expect(lines.every((l) => l.split(',').length === 3 && !l.includes('NaN'))).toBe(true);
  });

  it('prints the twin with --method sim and the twin beside the closed form with --method both', async () => {
    const sim = memoryIo(files);
    expect(await runCli(['response', 'ok.json', '--method', 'sim', '--dt', '0.01'], sim.io)).toBe(0);
    const simRows = sim.out().trim().split('\n');
    expect(simRows[0]).toBe('t,angle,velocity');
    expect(simRows).toHaveLength(202);

    const both = memoryIo(files);
    expect(await runCli(['response', 'ok.json', '--method', 'both', '--dt', '0.01'], both.io)).toBe(0);
    const rows = both.out().trim().split('\n');
    expect(rows[0]).toBe('t,angle,velocity,twinAngle,twinVelocity,residual');
    // With every effect off the twin is the linear model: the residual stays at integration error.
    const worst = Math.max(...rows.slice(1).map((r) => Math.abs(Number(r.split(',')[5]))));
    expect(worst).toBeLessThan(1e-8);
    // Same twin numbers whichever way they were asked for.
    expect(rows[150]!.split(',')[3]).toBe(simRows[150]!.split(',')[1]);

    const json = memoryIo(files);
    expect(await runCli(['response', 'ok.json', '--method', 'both', '--dt', '0.5', '--format', 'json'], json.io)).toBe(0);
    const doc = JSON.parse(json.out());
    expect(doc).toMatchObject({ method: 'both', twinStop: null, t: [0, 0.5, 1, 1.5, 2] });
    expect(doc.residual).toHaveLength(5);
  });

  it('exits 3 when the twin stops at a bound, naming the bound and the time, with the samples up to there', async () => {
    for (const method of ['sim', 'both']) {
      const m = memoryIo(files);
      expect(await runCli(['response', 'runaway.json', '--method', method, '--dt', '0.1'], m.io)).toBe(3);
      expect(m.err()).toMatch(/stopped early at t = \d+\.\d{4} s of 100 s: angle left ±\S+ rad at t = /);
      const rows = m.out().trim().split('\n').slice(1);
      const stoppedAt = Number(/stopped early at t = (\S+) s/.exec(m.err())![1]);
      expect(rows.length).toBeGreaterThan(10);
      expect(Number(rows.at(-1)!.split(',')[0])).toBeLessThanOrEqual(stoppedAt);
      expect(rows.every((r) => !r.includes('NaN'))).toBe(true);
    }
    // The closed form alone has no bound to hit: the same file prints every row and exits 0.
    const closed = memoryIo(files);
    expect(await runCli(['response', 'runaway.json', '--dt', '1'], closed.io)).toBe(0);
  });

  it('frequency prints JSON under the stable keys and CSV with one row per frequency, the verdicts on stderr', async () => {
    const json = memoryIo(files);
    expect(await runCli(['frequency', 'limited.json', '--from', '0.1', '--to', '100', '--points', '31', '--format', 'json'], json.io)).toBe(0);
    const doc = JSON.parse(json.out());
    expect(Object.keys(doc)).toEqual(['frequency', 'loop', 'referenceToAngle', 'torqueToAngle', 'margins', 'stability', 'notes', 'delayModel']);
    expect(doc.frequency).toHaveLength(31);
    expect(doc.frequency[0]).toBe(0.1);
    expect(doc.frequency[30]).toBe(100);
    for (const path of ['loop', 'referenceToAngle', 'torqueToAngle']) {
      expect(doc[path].magnitudeDb).toHaveLength(31);
      expect(doc[path].phaseDeg).toHaveLength(31);
    }
    expect(Object.keys(doc.margins)).toEqual(['gainMarginDb', 'phaseCrossover', 'phaseMarginDeg', 'gainCrossover', 'bandwidth']);
    expect(doc.stability).toBe('stable');
    expect(doc.notes).toContain("the linear model's response: the torque limit is not in it");
    expect(json.err()).toBe('');

    const csv = memoryIo(files);
    expect(await runCli(['frequency', 'ok.json', '--points', '5'], csv.io)).toBe(0);
    const rows = csv.out().trim().split('\n');
    expect(rows[0]).toBe('frequency,loopMagnitudeDb,loopPhaseDeg,referenceToAngleMagnitudeDb,referenceToAnglePhaseDeg,torqueToAngleMagnitudeDb,torqueToAnglePhaseDeg');
    expect(rows).toHaveLength(6);
    // Open loop: no loop and no reference path, so those cells are empty; the plant's are numbers.
    expect(rows[1]!.split(',').map((c) => c !== '')).toEqual([true, false, false, false, false, true, true]);
    expect(csv.err()).toMatch(/^kinetwin: open loop: there is no feedback/);
  });

  it('frequency --method sim adds the twin measured by injected sines, equal to the closed form with every effect off', async () => {
    const m = memoryIo(files);
    expect(await runCli(['frequency', 'ok.json', '--method', 'sim', '--from', '0.5', '--to', '20', '--points', '4', '--format', 'json'], m.io)).toBe(0);
    const doc = JSON.parse(m.out());
    expect(doc.measured).toMatchObject({ channel: 'torque', amplitude: 1 });
    doc.measured.magnitudeDb.forEach((x: number, i: number) => expect(x).toBeCloseTo(doc.torqueToAngle.magnitudeDb[i], 3));
    doc.measured.phaseDeg.forEach((x: number, i: number) => expect(x).toBeCloseTo(doc.torqueToAngle.phaseDeg[i], 1));
    expect(doc.measured.reason).toEqual([null, null, null, null]);

    const csv = memoryIo(files);
    expect(await runCli(['frequency', 'ok.json', '--method', 'sim', '--points', '2', '--from', '1', '--to', '2'], csv.io)).toBe(0);
    expect(csv.out().split('\n')[0]).toMatch(/,measuredMagnitudeDb,measuredPhaseDeg,measuredDistortion$/);

    // A transient slower than a run may last: no figure there, exit 3 naming the frequency.
    const slow = memoryIo({ 'slow.json': JSON.stringify({ ...scenario, joint: { inertia: 1, damping: 0.001, stiffness: 1 } }) });
    expect(await runCli(['frequency', 'slow.json', '--method', 'sim', '--points', '2', '--from', '1.5', '--to', '2'], slow.io)).toBe(3);
    expect(slow.err()).toMatch(/the twin has no figure at 1\.5 rad\/s: the transient needs/);
  });

  it('time prints the timing JSON under its stable keys for the closed form and the twin, and exits 3 when the twin stops early', async () => {
    for (const method of ['closed-form', 'sim']) {
      const m = memoryIo(files);
      expect(await runCli(['time', 'ok.json', '--method', method, '--dt', '0.01', '--runs', '7'], m.io)).toBe(0);
      const doc = JSON.parse(m.out());
      expect(Object.keys(doc)).toEqual(['method', 'runs', 'median_ms', 'p10_ms', 'p90_ms', 'samples']);
      expect(doc).toMatchObject({ method, runs: 7, samples: 201 });
      expect(doc.p10_ms).toBeLessThanOrEqual(doc.median_ms);
      expect(doc.median_ms).toBeLessThanOrEqual(doc.p90_ms);
    }
    const stopped = memoryIo(files);
    expect(await runCli(['time', 'runaway.json', '--method', 'sim', '--dt', '0.1', '--runs', '2'], stopped.io)).toBe(3);
    expect(stopped.err()).toMatch(/the twin stopped early at t = .*; nothing was timed/);
    expect(stopped.out()).toBe('');
  });

  it('linearize prints the linear model about the angle as a scenario file, its stiffness, holding torque and operating range', async () => {
    const elbow = {
      ...scenario,
      joint: { inertia: 0.2, damping: 0.5, stiffness: 0 },
      controller: { mode: 'pid', kp: 40, kd: 3, derivativeOn: 'measurement' },
      inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.05, delay: 0.1 }],
      nonlinear: { gravity: { mass: 2, arm: 0.3 } },
    };
    const m = memoryIo({ 'elbow.json': JSON.stringify(elbow) });
    expect(await runCli(['linearize', 'elbow.json', '--angle', '60deg'], m.io)).toBe(0);
    const doc = JSON.parse(m.out());
    expect(Object.keys(doc)).toEqual(['scenario', 'operatingAngle', 'holding', 'effectiveStiffness', 'holdingTorque', 'notes', 'range']);
    expect(doc.operatingAngle).toBeCloseTo(Math.PI / 3, 15);
    expect(doc.effectiveStiffness).toBeCloseTo(2 * 9.80665 * 0.3 * 0.5, 12);
    expect(doc.range).toMatchObject({ tolerance: 0.01 });
    expect(doc.range.largestMove).toBeGreaterThan(0);
    // The printed scenario is a scenario file the other commands take.
    const again = memoryIo({ 'linear.json': JSON.stringify(doc.scenario) });
    expect(await runCli(['check', 'linear.json'], again.io)).toBe(0);
    const flat = memoryIo(files);
    expect(await runCli(['linearize', 'ok.json', '--angle', '0.5'], flat.io)).toBe(2);
    expect(flat.err()).toContain('"nonlinear.gravity"');
  });

  it.each([
    [['linearize', 'ok.json'], '--angle'],
    [['linearize', 'ok.json', '--angle', 'up'], '--angle'],
    [['linearize', 'ok.json', '--angle', '1', '--holding', 'both'], '--holding'],
    [['linearize', 'ok.json', '--angle', '1', '--tolerance', '5'], '--tolerance'],
    [['linearize', 'ok.json', '--angle', '1', '--format', 'csv'], '--format'],
    [['time', 'ok.json', '--runs', '0'], '--runs'],
    [['time', 'ok.json', '--runs', '2.5'], '--runs'],
    [['time', 'ok.json', '--method', 'both'], '--method'],
    [['time', 'ok.json', '--format', 'csv'], '--format'],
    [['time', 'ok.json', '--points', '5'], '--points'],
    [['time', 'ok.json', '--dt', '1e-9'], '--dt'],
    [['frequency', 'ok.json', '--channel', 'torque'], '--channel'],
    [['frequency', 'ok.json', '--method', 'sim', '--amplitude', '-1'], '--amplitude'],
    [['frequency', 'ok.json', '--method', 'both'], '--method'],
    [['frequency', 'ok.json', '--method', 'sim', '--channel', 'reference'], 'channel'],
    [['frequency', 'ok.json', '--points', '1'], '--points'],
    [['frequency', 'ok.json', '--from', '10', '--to', '1'], '--to'],
    [['frequency', 'ok.json', '--from', 'low'], '--from'],
    [['frequency', 'ok.json', '--dt', '0.01'], '--dt'],
    [['response', 'ok.json', '--points', '10'], '--points'],
    [['check', 'ok.json', '--from', '1'], '--from'],
  ])('frequency arguments: %j exits 2 naming %s', async (argv, field) => {
    const m = memoryIo(files);
    expect(await runCli(argv, m.io)).toBe(2);
    expect(m.err()).toContain(field);
  });

  it('stops the twin of a grinding scenario at a bound and says so, keeping the rows up to there', async () => {
    const m = memoryIo(files);
    expect(await runCli(['response', 'grind.json', '--method', 'sim', '--dt', '0.001'], m.io)).toBe(3);
    // Which bound the grind meets first (its work budget, or friction switching every few
    // samples of the 1 µs loop) depends on how cheaply the twin takes a sample; both name a time.
    expect(m.err()).toMatch(
      /^kinetwin: the twin stopped early at t = 0\.\d{4} s of \S+ s: (work budget: .* evaluations by t = 0\.\d{4} s, over the twin's allowance|friction event bound: \d+ stick\/slip switches by t = 0\.\d{4} s)/,
    );
    const rows = m.out().trim().split('\n');
    expect(rows.length).toBeGreaterThan(200);
    expect(rows.length).toBeLessThan(3002);
    expect(rows.some((r) => r.includes('NaN'))).toBe(false);
  }, 60_000);

  it('check reports superposition, shift and the linear range, and explains a torque limit', async () => {
    const linear = memoryIo(files);
    expect(await runCli(['check', 'ok.json'], linear.io)).toBe(0);
    const ok = JSON.parse(linear.out());
    expect(ok.superposition).toMatchObject({ pass: true, threshold: 1e-4 });
    expect(ok.shift).toMatchObject({ pass: true });
    expect(ok.linearRange).toBe(1000);

    const limited = memoryIo(files);
    expect(await runCli(['check', 'limited.json'], limited.io)).toBe(0);
    const doc = JSON.parse(limited.out());
    expect(doc.superposition.pass).toBe(false);
    expect(doc.superposition.reason).toMatch(/torque limit/);
    // The step asks for 20 N·m at first; a 2 N·m limit leaves roughly a tenth of it linear.
    expect(doc.linearRange).toBeGreaterThan(0.05);
    expect(doc.linearRange).toBeLessThan(0.2);
  });
});
