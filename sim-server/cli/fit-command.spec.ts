import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { staircaseSignal, synthesizeTrace } from '../../shared/calibration/testing/synthetic-log';
import { withRecordings } from '../../shared/twin/recorded-samples';
import { buildScenario } from '../../shared/twin/testing/build-scenario';
import { readLogFile } from '../logs/read-log-file';
import { parseCliArguments } from './cli-arguments';
import { runCli } from './run-cli';
import { memoryIo as sharedMemoryIo } from './testing/memory-io';

// `kinetwin fit` in-process: scenario and log from memory, the log through the real streamed reader.
const truth = { inertia: 0.05, damping: 0.3, stiffness: 2 };
const signal = staircaseSignal(2, 500, 0.1, 0.4, 5);
const logged = withRecordings(
  buildScenario({ joint: truth, controller: { mode: 'open-loop' }, inputs: [], horizon: 2, recordedInputs: [{ channel: 'torque', logId: 'x', signal: 'torque' }] }),
  () => signal,
);
if (!logged.ok) throw new Error('bad synthetic scenario');
const measured = synthesizeTrace(logged.value, 500, 2e-4, null, 7);
const deg = 180 / Math.PI;
/** A messy but valid log: semicolons, CRLF, ms and degrees named in the header, time not starting at 0. */
const logText = ['time_ms;angle [deg];torque', ...Array.from(measured.t, (t, i) => `${(1000 * t + 2000).toFixed(1)};${(measured.angle[i]! * deg).toFixed(6)};${signal.values[i]!.toFixed(6)}`)].join('\r\n');
const start = { kind: 'kinetwin/scenario', version: 1, name: 'fit start', joint: { inertia: 0.08, damping: 0.2, stiffness: 3 }, controller: { mode: 'open-loop' }, horizon: 2 };

const memoryIo = (files: Record<string, string>) =>
  sharedMemoryIo(files, { readLog: (path, options) => readLogFile(Readable.from([files[path] ?? '']), options) });

const files = { 'start.json': JSON.stringify(start), 'log.csv': logText, 'bad.csv': 'time;angle;torque\n0;0;0.1\n0.002;x;0.1\n0.004;0;0.1\n' };

describe('kinetwin fit', () => {
  it('prints each parameter under its name with an interval holding the truth, rms, r2 and warnings', async () => {
    const m = memoryIo(files);
    const code = await runCli(['fit', 'start.json', 'log.csv', '--params', 'inertia,damping,stiffness', '--columns', 't=time_ms,angle=angle [deg],torque=torque', '--units', 'angle=deg,t=ms'], m.io);
    expect(code, m.err()).toBe(0);
    const doc = JSON.parse(m.out());
    for (const [name, value] of Object.entries(truth)) {
      expect(doc[name].low).toBeLessThanOrEqual(value);
      expect(doc[name].high).toBeGreaterThanOrEqual(value);
      expect(doc[name].value).toBeGreaterThan(doc[name].low);
    }
    expect(doc.rms).toBeGreaterThan(1.5e-4);
    expect(doc.rms).toBeLessThan(2.5e-4);
    expect(doc.r2).toBeGreaterThan(0.999);
    expect(doc.warnings).toEqual([]);
    expect(doc.log.samples).toBe(measured.t.length);
  });

  it('exits 2 naming the row and column of a bad cell', async () => {
    const m = memoryIo(files);
    expect(await runCli(['fit', 'start.json', 'bad.csv', '--params', 'inertia'], m.io)).toBe(2);
    expect(m.err()).toMatch(/bad log bad\.csv: "row 3, column 2 \("angle"\)": "x" is not a number/);
    expect(m.out()).toBe('');
  });

  it('exits 2 for a window the log does not fill', async () => {
    const m = memoryIo(files);
    expect(await runCli(['fit', 'start.json', 'log.csv', '--params', 'inertia', '--window', '5:6'], m.io)).toBe(2);
    expect(m.err()).toMatch(/"window": the window 5 to 6 s holds 0 measured samples/);
  });
});

describe('kinetwin fit arguments', () => {
  it('reads the mapping, units, window and parameters', () => {
    expect(parseCliArguments(['fit', 's.json', 'l.csv', '--params', 'inertia,coulombFriction', '--columns', 't=0,angle=enc', '--units', 'angle=deg,t=ms,torque=Nm', '--window', '0.5:4'])).toEqual({
      ok: true,
      value: {
        command: 'fit',
        file: 's.json',
        log: 'l.csv',
        params: ['inertia', 'coulombFriction'],
        logOptions: { columns: { time: 0, angle: 'enc' }, units: { angle: 'deg', time: 'ms', torque: 'N·m' } },
        window: { start: 0.5, end: 4 },
        initial: 'log',
        hold: 'zoh',
      },
    });
  });

  it('names each bad argument', () => {
    expect(parseCliArguments(['fit', 's.json'])).toEqual({ ok: false, errors: [{ field: 'LOG', message: 'fit needs a SCENARIO file and a LOG.csv file' }] });
    const bad = parseCliArguments(['fit', 's.json', 'l.csv', '--params', 'inertia,kp', '--window', '3:1', '--columns', 'speed=2', '--hold', 'cubic']);
    expect(bad.ok).toBe(false);
    if (bad.ok) return;
    expect(bad.errors.map((e) => e.field)).toEqual(['--params', '--columns', '--window', '--hold']);
    expect(parseCliArguments(['fit', 's.json', 'l.csv'])).toMatchObject({ ok: false, errors: [{ field: '--params' }] });
    expect(parseCliArguments(['response', 's.json', '--params', 'inertia'])).toMatchObject({ ok: false, errors: [{ field: '--params', message: '--params belongs to "fit", not "response"' }] });
  });
});
