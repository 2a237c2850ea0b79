import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createLogBuilder, type LogBuildResult } from './log-builder';
import type { LogReadOptionsInput } from './log-options';
import { LOG_SIGNALS } from './log-signals';

/** Cells a messy or hostile log holds: numbers in both locales, placeholders, text, control characters. */
const messyCell = fc.oneof(
  fc.double({ noNaN: false }).map(String),
  fc.double({ min: -1e6, max: 1e6, noNaN: true }).map((v) => String(v).replace('.', ',')),
  fc.integer().map(String),
  fc.constantFrom('', ' ', 'NaN', 'nan', 'inf', '-Infinity', '1e400', '-1e-400', '1,234.5', '\uFEFF0', '0\r', '\u0000', '"', '—', 'time', 'angle [deg]', 'enc_counts', 't_ms', 'torque'),
  fc.string({ unit: 'binary', maxLength: 12 }),
);

/** Options a caller may send, well-formed or not (the builder must refuse the bad ones as values). */
const anyOptions: fc.Arbitrary<LogReadOptionsInput> = fc.record(
  {
    header: fc.constantFrom('auto', 'present', 'absent', 'maybe'),
    columns: fc.dictionary(fc.constantFrom(...LOG_SIGNALS, 'junk'), fc.oneof(fc.nat({ max: 6 }), fc.constantFrom('time', 'angle', 'x', -1, 1.5))),
    units: fc.record({ time: fc.constantFrom('s', 'ms', 'h'), angle: fc.constantFrom('rad', 'deg', 'counts') }, { requiredKeys: [] }),
    countsPerRev: fc.oneof(fc.double(), fc.constantFrom(1, 4096)),
    decimalMark: fc.constantFrom('auto', '.', ','),
    missing: fc.constantFrom('refuse', 'skip-row'),
    duplicateTimes: fc.constantFrom('refuse', 'keep-first'),
    gaps: fc.constantFrom('refuse', 'allow'),
    gapFactor: fc.double(),
    resample: fc.oneof(fc.constant('median'), fc.double({ min: 1e-3, max: 10 }), fc.double()),
    maxSamples: fc.oneof(fc.integer({ min: -5, max: 50 }), fc.constant(2_000_000)),
  },
  { requiredKeys: [] },
) as fc.Arbitrary<LogReadOptionsInput>;

function run(rows: readonly (readonly string[])[], options: LogReadOptionsInput): LogBuildResult {
  const builder = createLogBuilder(options);
  rows.forEach((cells, i) => builder.push(cells, i + 1));
  return builder.finish();
}

function allFinite(result: LogBuildResult): boolean {
  if (!result.ok) return true;
  for (const values of Object.values(result.table)) if (values && !values.every(Number.isFinite)) return false;
  const t = result.report.timing;
  return [t.start, t.end, t.medianStep, t.minStep, t.maxStep].every(Number.isFinite);
}

describe('log builder properties (fast-check)', () => {
  it('never throws and never yields NaN or an infinity, whatever the rows and options', () => {
    fc.assert(
      fc.property(fc.array(fc.array(messyCell, { maxLength: 6 }), { maxLength: 30 }), anyOptions, (rows, options) => {
        const result = run(rows, options);
        expect(allFinite(result)).toBe(true);
        if (!result.ok) expect(result.error.reason).toMatch(/\S/);
      }),
      { numRuns: 400 },
    );
  });

  it('reads back any strictly increasing trace exactly, printed in either decimal mark', () => {
    const trace = fc
      .array(fc.tuple(fc.double({ min: 1e-3, max: 10, noNaN: true }), fc.double({ min: -1e3, max: 1e3, noNaN: true })), { minLength: 2, maxLength: 60 })
      .map((pairs) => {
        let t = 0;
        // String(-0) is "0": the trace holds +0 so the printed text reads back to the same value.
        return pairs.map(([dt, angle]) => [(t += dt), angle === 0 ? 0 : angle] as const);
      });
    fc.assert(
      fc.property(trace, fc.constantFrom('.', ','), (samples, mark) => {
        const print = (v: number) => (mark === ',' ? String(v).replace('.', ',') : String(v));
        const rows = [['time', 'angle'], ...samples.map(([t, a]) => [print(t), print(a)])];
        const result = run(rows, { gaps: 'allow' });
        if (!result.ok) throw new Error(JSON.stringify(result.error));
        expect(Array.from(result.table.time)).toEqual(samples.map(([t]) => t));
        expect(Array.from(result.table.angle!)).toEqual(samples.map(([, a]) => a));
        expect(result.report.samples).toBe(samples.length);
      }),
      { numRuns: 200 },
    );
  });

  it('gives every refusal a row within the rows pushed, or none', () => {
    fc.assert(
      fc.property(fc.array(fc.array(messyCell, { minLength: 1, maxLength: 4 }), { minLength: 1, maxLength: 20 }), (rows) => {
        const result = run(rows, {});
        if (!result.ok && result.error.row !== null) {
          expect(result.error.row).toBeGreaterThanOrEqual(1);
          expect(result.error.row).toBeLessThanOrEqual(rows.length);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('resampled output is uniform, starts at the first sample and stays within the samples’ range', () => {
    const trace = fc.array(fc.tuple(fc.double({ min: 0.01, max: 1, noNaN: true }), fc.double({ min: -10, max: 10, noNaN: true })), { minLength: 3, maxLength: 40 });
    fc.assert(
      fc.property(trace, (pairs) => {
        let t = 0;
        const rows = [['time', 'angle'], ...pairs.map(([dt, a]) => [String((t += dt)), String(a)])];
        const result = run(rows, { gaps: 'allow', resample: 'median' });
        if (!result.ok) throw new Error(JSON.stringify(result.error));
        const { time, angle } = result.table;
        const step = result.report.resampled!.step;
        for (let i = 1; i < time.length; i++) expect(time[i]! - time[i - 1]!).toBeCloseTo(step, 9);
        expect(time[0]).toBe(pairs[0]![0]);
        const lo = Math.min(...pairs.map((p) => p[1]));
        const hi = Math.max(...pairs.map((p) => p[1]));
        for (const v of angle!) {
          expect(v).toBeGreaterThanOrEqual(lo - 1e-12);
          expect(v).toBeLessThanOrEqual(hi + 1e-12);
        }
      }),
      { numRuns: 150 },
    );
  });
});
