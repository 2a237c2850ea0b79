import { execFile } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createRequire } from 'node:module';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { evaluateClosedForm, solveClosedForm } from '../../shared/closed-form/index';

// The real command, run as a child process on files in a temp dir: once through the published
// entry (bin/kinetwin.mjs, which starts a second node with tsx), otherwise straight through
// `node --import tsx main.ts` (the same program, one process start cheaper).
const BIN = fileURLToPath(new URL('../../bin/kinetwin.mjs', import.meta.url));
const MAIN = fileURLToPath(new URL('./main.ts', import.meta.url));
const TSX = pathToFileURL(createRequire(import.meta.url).resolve('tsx')).href;

function kinetwin(args: string[], cwd: string, viaBin = false): Promise<{ code: number; stdout: string; stderr: string }> {
  const argv = viaBin ? [BIN, ...args] : ['--import', TSX, MAIN, ...args];
  return new Promise((resolve) => {
    execFile(process.execPath, argv, { cwd, maxBuffer: 64 * 1024 * 1024 }, (err, stdout, stderr) => {
      resolve({ code: err ? Number((err as NodeJS.ErrnoException & { code: unknown }).code) : 0, stdout, stderr });
    });
  });
}

const scenario = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'cli joint',
  joint: { inertia: 0.05, damping: 0.1, stiffness: 0, gearRatio: 2 },
  controller: { mode: 'pid', kp: 3, ki: 2, kd: 0.2, derivativeFilter: 0.01 },
  initial: { angle: 0.01, velocity: 0 },
  inputs: [
    { channel: 'reference', shape: 'step', amplitude: 0.5 },
    { channel: 'torque', shape: 'step', amplitude: -0.2, delay: 0.5 },
  ],
  horizon: 1,
  limits: { overshootPercent: 50, settlingTime: 5, steadyStateError: 0.001 },
};

// Issue 10 §1: a joint creeping at its torque limit until its anti-windup integrator slides on
// the limit at t ≈ 2.05 s; the twin once stopped there and the command still exited 0.
const creeping = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'creeping at the limit',
  joint: { inertia: 0.05, damping: 5, stiffness: 0 },
  controller: { mode: 'pid', kp: 10, ki: 50, kd: 0.1, derivativeOn: 'measurement' },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.05 }],
  horizon: 4,
  nonlinear: { torqueLimit: 1, antiWindup: true },
};

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'kinetwin-cli-'));
  await writeFile(join(dir, 'ok.json'), JSON.stringify(scenario));
  await writeFile(join(dir, 'strict.json'), JSON.stringify({ ...scenario, limits: { overshootPercent: 1, settlingTime: null, steadyStateError: null } }));
  await writeFile(join(dir, 'bad.json'), JSON.stringify({ ...scenario, joint: { inertia: -1, damping: 0, stiffness: 0 } }));
  await writeFile(join(dir, 'creeping.json'), JSON.stringify(creeping));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

// Each run starts node + tsx (~1–2 s on a loaded 2-core machine): a few runs, concurrently, with room.
const CHILD_TIMEOUT_MS = 60_000;

describe.concurrent('kinetwin command (child process)', { timeout: CHILD_TIMEOUT_MS }, () => {
  it('prints the closed form as CSV with the stable header, the same numbers as the library (via bin/kinetwin.mjs)', async () => {
    const r = await kinetwin(['response', 'ok.json', '--dt', '0.01'], dir, true);
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split('\n');
    expect(lines[0]).toBe('t,angle,velocity');
    expect(lines).toHaveLength(102);
    const solved = solveClosedForm(scenario);
    if (!solved.ok) throw new Error('library refused the scenario');
    const sampled = evaluateClosedForm(solved.value, 0.01, 1);
    if (!sampled.ok) throw new Error('library refused the grid');
    const lib = sampled.value;
    lines.slice(1).forEach((line, i) => {
      const [t, angle, velocity] = line.split(',').map(Number);
      expect([t, angle, velocity]).toEqual([lib.t[i], lib.angle[i], lib.velocity[i]]);
    });
  });

  it('prints JSON with terms, poles, theorems and metrics under stable keys', async () => {
    const r = await kinetwin(['response', 'ok.json', '--dt', '0.1', '--format', 'json'], dir);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    const solved = solveClosedForm(scenario);
    if (!solved.ok) throw new Error('library refused the scenario');
    expect(doc.t).toHaveLength(11);
    expect(doc.poles).toEqual(solved.value.poles);
    expect(Object.keys(doc.poles[0]).sort()).toEqual(['im', 'multiplicity', 're']);
    expect(doc.finalValue).toEqual(solved.value.finalValue);
    expect(doc.initialValue).toMatchObject({ angle: solved.value.initialValue.angle, velocity: solved.value.initialValue.velocity });
    expect(doc.metrics).toEqual(solved.value.metrics);
    expect(Object.keys(doc.metrics).sort()).toEqual(['overshootPercent', 'peakTime', 'riseTime', 'settlingTime', 'steadyStateError']);
    expect(doc.stable).toBe(true);
    expect(doc.terms.length).toBeGreaterThan(0);
    const sampled = evaluateClosedForm(solved.value, 0.1, 1);
    expect(sampled.ok && doc.angle).toEqual(sampled.ok && Array.from(sampled.value.angle));
  });

  it('check exits 0 when the limits are met and prints the report', async () => {
    const r = await kinetwin(['check', 'ok.json'], dir);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc).toMatchObject({ passed: true, stable: true, finalValue: { applies: true } });
    expect(doc.safety).toContain('not a safety validation');
  });

  it('check exits 1 when a limit is not met', async () => {
    const r = await kinetwin(['check', 'strict.json'], dir);
    expect(r.code).toBe(1);
    expect(JSON.parse(r.stdout)).toMatchObject({ passed: false, limits: [{ limit: 'overshootPercent', met: false }] });
  });

  it('response --method sim runs the anti-windup integrator sliding on the limit to the horizon and exits 0 (via bin/kinetwin.mjs)', async () => {
    const r = await kinetwin(['response', 'creeping.json', '--method', 'sim', '--dt', '0.001'], dir, true);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split('\n');
    expect(lines[0]).toBe('t,angle,velocity');
    expect(lines).toHaveLength(4002);
    const [t, angle] = lines.at(-1)!.split(',').map(Number);
    expect(t).toBe(4);
    // Past the slide the integral brings the joint back towards the reference.
    expect(angle).toBeCloseTo(0.487, 3);
  });

  it('sweep prints a gain map as JSON, rows along y, and exits 0 when a cell meets every limit (via bin/kinetwin.mjs)', async () => {
    const r = await kinetwin(['sweep', 'ok.json', '--x', 'kp:1:6:3', '--y', 'kd:0.05:0.4:2', '--z', 'ki:2'], dir, true);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.axes.x.values).toEqual([1, 3.5, 6]);
    expect(doc.axes.z).toMatchObject({ gain: 'ki', value: 2 });
    expect(doc.metrics.overshootPercent).toHaveLength(2);
    expect(doc.metrics.overshootPercent[0]).toHaveLength(3);
    // The same cell as the library's own closed form of that scenario.
    const cell = solveClosedForm({ ...scenario, controller: { ...scenario.controller, kp: 6, kd: 0.4, ki: 2 } });
    if (!cell.ok) throw new Error('library refused the scenario');
    expect(doc.metrics.overshootPercent[1][2]).toBe(cell.value.metrics.overshootPercent);
    expect(doc.metrics.settlingTime[1][2]).toBe(cell.value.metrics.settlingTime);
    expect(doc.suggested).not.toBeNull();
  });

  it('sweep exits 2 naming the argument', async () => {
    const r = await kinetwin(['sweep', 'ok.json', '--x', 'kp:0:50:40'], dir);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('"--y"');
  });

  it('exits 2 on invalid input, naming the field and the reason', async () => {
    const bad = await kinetwin(['check', 'bad.json'], dir);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('"joint.inertia"');
    expect(bad.stderr).toContain('positive');
    expect(JSON.parse(bad.stdout)).toMatchObject({ valid: false, errors: [{ field: 'joint.inertia' }] });
  });
});
