import { describe, expect, it } from 'vitest';
import { runCli, type CliIo } from './run-cli';

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

function memoryIo(files: Record<string, string>) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = {
    readText: async (path) => {
      if (!(path in files)) throw Object.assign(new Error(`ENOENT: no such file or directory, open '${path}'`), { code: 'ENOENT' });
      return files[path]!;
    },
    writeOut: async (chunk) => {
      out.push(chunk);
    },
    writeErr: (text) => {
      err.push(text);
    },
  };
  return { io, out: () => out.join(''), err: () => err.join('') };
}

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

  it('stops the twin of a grinding scenario at the work budget and says so, keeping the rows up to there', async () => {
    const m = memoryIo(files);
    expect(await runCli(['response', 'grind.json', '--method', 'sim', '--dt', '0.001'], m.io)).toBe(0);
    expect(m.err()).toMatch(/^kinetwin: the twin stopped early: work budget: .* evaluations by t = 0\.\d{4} s, over the twin's allowance/);
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
