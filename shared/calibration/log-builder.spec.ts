import { describe, expect, it } from 'vitest';
import { createLogBuilder, type LogBuildResult } from './log-builder';
import type { LogReadOptionsInput } from './log-options';

/** Rows as a CSV reader hands them over, numbered from 1 like lines in an editor. */
function build(rows: string[][], options?: LogReadOptionsInput): LogBuildResult {
  const builder = createLogBuilder(options);
  for (const [i, cells] of rows.entries()) {
    const pushed = builder.push(cells, i + 1);
    if (!pushed.ok) break;
  }
  return builder.finish();
}

function ok(result: LogBuildResult) {
  if (!result.ok) throw new Error(`refused: ${JSON.stringify(result.error)}`);
  return result;
}

function refusal(result: LogBuildResult) {
  if (result.ok) throw new Error('expected a refusal');
  return result.error;
}

const DEG = Math.PI / 180;

describe('log builder: header and mapping', () => {
  it('detects time, angle, velocity, set-point and torque by header and converts units to SI', () => {
    const r = ok(
      build([
        ['time [ms]', 'angle [deg]', 'vel [deg/s]', 'setpoint (deg)', 'torque [Nm]'],
        ['0', '90', '180', '0', '0.5'],
        ['10', '180', '360', '1', '-0.5'],
      ]),
    );
    expect(Array.from(r.table.time)).toEqual([0, 0.01]);
    expect(r.table.angle![1]).toBeCloseTo(Math.PI, 15);
    expect(r.table.velocity![1]).toBeCloseTo(2 * Math.PI, 15);
    expect(r.table.setpoint![1]).toBeCloseTo(DEG, 15);
    expect(Array.from(r.table.torque!)).toEqual([0.5, -0.5]);
    expect(r.report.columns.map((c) => [c.signal, c.index, c.unit, c.unitSource, c.columnSource])).toEqual([
      ['time', 0, 'ms', 'header', 'header'],
      ['angle', 1, 'deg', 'header', 'header'],
      ['velocity', 2, 'deg/s', 'header', 'header'],
      ['setpoint', 3, 'deg', 'header', 'header'],
      ['torque', 4, 'N·m', 'header', 'header'],
    ]);
    expect(r.report.header).toEqual(['time [ms]', 'angle [deg]', 'vel [deg/s]', 'setpoint (deg)', 'torque [Nm]']);
  });

  it('takes a mapping the user corrected, by name or position, and their units over the header', () => {
    const rows = [
      ['stamp', 'x', 'y'],
      ['0', '1', '2'],
      ['1', '3', '4'],
    ];
    expect(refusal(build(rows))).toMatchObject({ row: 1, reason: expect.stringContaining('no time column') });
    const r = ok(build(rows, { columns: { time: 'STAMP', torque: 2 }, units: { time: 'ms' } }));
    expect(r.report.columns.map((c) => [c.signal, c.index, c.columnSource, c.unit, c.unitSource])).toEqual([
      ['time', 0, 'given', 'ms', 'given'],
      ['torque', 2, 'given', 'N·m', 'default'],
    ]);
    expect(r.table.angle).toBeUndefined();
    expect(Array.from(r.table.torque!)).toEqual([2, 4]);
  });

  it('reads a log without a header as time, angle by position, or as mapped', () => {
    const r = ok(build([['0', '0.1', '9'], ['0.5', '0.2', '9']]));
    expect(r.report.header).toBeNull();
    expect(r.report.columns.map((c) => [c.signal, c.columnSource])).toEqual([
      ['time', 'position'],
      ['angle', 'position'],
    ]);
    const mapped = ok(build([['9', '0', '0.1'], ['9', '0.5', '0.2']], { header: 'absent', columns: { time: 1, velocity: 2 } }));
    expect(Array.from(mapped.table.velocity!)).toEqual([0.1, 0.2]);
  });

  it('refuses a mapping by header name when there is no header, and columns beyond the row', () => {
    expect(refusal(build([['0', '1'], ['1', '2']], { columns: { time: 'time', angle: 1 } })).reason).toContain('no header row');
    expect(refusal(build([['t', 'a'], ['0', '1']], { columns: { time: 0, angle: 5 } })).reason).toContain('rows have 2 columns');
    expect(refusal(build([['t', 'a'], ['0', '1']], { columns: { time: 'nope', angle: 1 } })).reason).toContain('not a header of this log');
  });

  it('refuses two signals on one column, and a log with only time', () => {
    expect(refusal(build([['t', 'a'], ['0', '1']], { columns: { time: 0, angle: 1, torque: 1 } }))).toMatchObject({ row: 1, column: 'column 2 ("a")', reason: 'angle and torque are both mapped to this column' });
    expect(refusal(build([['time', 'temperature'], ['0', '1']])).reason).toContain('no signal column besides time');
  });

  it('reads encoder counts with counts per revolution, and asks for it otherwise', () => {
    const rows = [
      ['time', 'enc_counts'],
      ['0', '0'],
      ['1', '1024'],
    ];
    expect(refusal(build(rows))).toMatchObject({ row: 1, column: 'column 2 ("enc_counts")', reason: expect.stringContaining('countsPerRev') });
    const r = ok(build(rows, { countsPerRev: 4096 }));
    expect(r.table.angle![1]).toBeCloseTo(Math.PI / 2, 15);
    expect(r.report.countsPerRev).toBe(4096);
  });

  it('forces the first row to be a header or data when told', () => {
    // "1e3" looks like data, but the user says it is the header row.
    const r = ok(build([['0', '1'], ['1', '2'], ['2', '3']], { header: 'present', columns: { time: 0, angle: 1 } }));
    expect(r.report.header).toEqual(['0', '1']);
    expect(r.report.samples).toBe(2);
    expect(refusal(build([['time', 'angle'], ['0', '1']], { header: 'absent' }))).toMatchObject({ row: 1, column: 'column 1', reason: '"time" is not a number' });
  });

  it('refuses bad options as a value, naming the option', () => {
    const r = refusal(build([['t', 'a']], { maxSamples: 1 } as LogReadOptionsInput));
    expect(r.reason).toContain('option maxSamples');
    expect(refusal(build([], { units: { angle: 'grad' } } as unknown as LogReadOptionsInput)).reason).toContain('option units.angle');
  });
});

describe('log builder: messy cells', () => {
  it('strips a BOM, CR left by CRLF and spaces', () => {
    const r = ok(build([['\uFEFFtime', ' angle\r'], [' 0 ', '1\r'], ['1', '2\r']]));
    expect(r.report.bomRemoved).toBe(true);
    expect(r.report.header).toEqual(['time', 'angle']);
    expect(Array.from(r.table.angle!)).toEqual([1, 2]);
    expect(r.report.notes[0]).toContain('byte-order mark');
  });

  it('reads decimal commas and says so', () => {
    const r = ok(build([['t', 'angle'], ['0,0', '1,5'], ['0,1', '-2,25']]));
    expect(Array.from(r.table.angle!)).toEqual([1.5, -2.25]);
    expect(r.report.decimalMark).toBe(',');
    expect(r.report.notes.join(' ')).toContain('Decimal commas');
  });

  it('refuses a cell whose decimal mark differs from earlier cells, naming row and column', () => {
    expect(refusal(build([['t', 'angle'], ['0.0', '1.5'], ['0.1', '2,5']]))).toEqual({ row: 3, column: 'column 2 ("angle")', reason: expect.stringContaining('earlier cells used "."') });
    expect(refusal(build([['t', 'angle'], ['0', '1.5']], { decimalMark: ',' })).row).toBe(2);
  });

  it('refuses text, infinities and empty or NaN cells by default, naming row and column', () => {
    expect(refusal(build([['t', 'angle'], ['0', '1'], ['1', 'abc']]))).toEqual({ row: 3, column: 'column 2 ("angle")', reason: '"abc" is not a number' });
    expect(refusal(build([['t', 'angle'], ['0', 'inf']])).reason).toContain('not a finite number');
    expect(refusal(build([['t', 'angle'], ['0', '1'], ['1', '']]))).toEqual({ row: 3, column: 'column 2 ("angle")', reason: expect.stringContaining('the cell is empty') });
    expect(refusal(build([['t', 'angle'], ['0', 'NaN']]))).toEqual({ row: 2, column: 'column 2 ("angle")', reason: expect.stringContaining('"NaN" is not a value') });
    expect(refusal(build([['t', 'angle'], ['0']]))).toEqual({ row: 2, column: 'column 2 ("angle")', reason: expect.stringContaining('the row ends before this column') });
  });

  it('drops rows with missing cells when asked, counting them', () => {
    const r = ok(build([['t', 'angle', 'note'], ['0', '1', 'x'], ['1', 'NaN', ''], ['2', '', 'x'], ['3', '4', '']], { missing: 'skip-row' }));
    expect(Array.from(r.table.time)).toEqual([0, 3]);
    expect(r.report.skippedRows).toEqual({ count: 2, rows: [3, 4] });
    expect(r.report.rows).toBe(4);
  });

  it('ignores cells of unmapped columns whatever they hold', () => {
    const r = ok(build([['time', 'angle', 'comment'], ['0', '1', 'start'], ['1', '2', 'NaN']]));
    expect(r.report.samples).toBe(2);
  });

  it('skips blank rows and reports them', () => {
    const r = ok(build([[''], ['t', 'angle'], ['', ''], ['0', '1'], [], ['1', '2']]));
    expect(r.report.blankRows).toBe(3);
    expect(r.report.samples).toBe(2);
  });

  it('refuses values that overflow on conversion, and clock-time stamps', () => {
    expect(refusal(build([['t', 'angle [counts]'], ['0', '1e308']], { countsPerRev: 1 })).reason).toContain('out of range in SI');
    expect(refusal(build([['t [ms]', 'angle'], ['1764750000000', '0']])).reason).toContain('not as a clock time');
  });

  it('refuses a row with more cells than any log has columns', () => {
    expect(refusal(build([Array.from({ length: 300 }, () => '1')])).reason).toContain('at most 256 columns');
  });
});

describe('log builder: time', () => {
  it('refuses times that go back, naming the row, the column and the earlier row', () => {
    expect(refusal(build([['time', 'angle'], ['0', '0'], ['1', '0'], ['0.5', '0']]))).toEqual({ row: 4, column: 'column 1 ("time")', reason: 'time 0.5 s goes back from 1 s on row 3; times must increase' });
  });

  it('refuses duplicate times by default and keeps the first when asked', () => {
    const rows = [['time', 'angle'], ['0', '0'], ['1', '5'], ['1', '6'], ['2', '7']];
    expect(refusal(build(rows))).toEqual({ row: 4, column: 'column 1 ("time")', reason: expect.stringContaining("repeats row 3's") });
    const r = ok(build(rows, { duplicateTimes: 'keep-first' }));
    expect(Array.from(r.table.angle!)).toEqual([0, 5, 7]);
    expect(r.report.duplicateTimes).toEqual({ count: 1, rows: [4] });
  });

  it('refuses a gap by default naming the rows either side, and keeps gaps when allowed', () => {
    const rows = [['time', 'angle'], ['0', '0'], ['1', '0'], ['', ''], ['2', '0'], ['3', '0'], ['20', '0'], ['21', '0']];
    expect(refusal(build(rows))).toEqual({ row: 7, column: 'column 1 ("time")', reason: expect.stringMatching(/jumps by 17 s from row 6, over 5 × the median step of 1 s/) });
    const r = ok(build(rows, { gaps: 'allow' }));
    expect(r.report.gaps).toEqual({ count: 1, first: [{ fromRow: 6, toRow: 7, step: 17 }] });
    expect(ok(build(rows, { gapFactor: 20 })).report.gaps.count).toBe(0);
  });

  it('names rows correctly past skipped and blank rows', () => {
    const rows = [['time', 'angle'], ['0', '0'], ['', ''], ['1', 'NaN'], ['1', '0'], ['2', '0'], ['50', '0']];
    expect(refusal(build(rows, { missing: 'skip-row' }))).toMatchObject({ row: 7, reason: expect.stringContaining('from row 6') });
  });

  it('reports uneven sampling and keeps the logged times unless resampling is asked', () => {
    const rows = [['time', 'angle'], ['0', '0'], ['1', '1'], ['3', '3'], ['4', '4'], ['5.5', '5.5']];
    const kept = ok(build(rows));
    expect(kept.report.timing).toMatchObject({ uniform: false, minStep: 1, maxStep: 2 });
    expect(kept.report.resampled).toBeNull();
    expect(Array.from(kept.table.time)).toEqual([0, 1, 3, 4, 5.5]);
    expect(kept.report.notes.join(' ')).toContain('Sampling is uneven');
  });

  it('resamples onto a uniform grid by linear interpolation when asked, and reports it', () => {
    const rows = [['time', 'angle', 'torque'], ['0', '0', '0'], ['1', '1', '2'], ['3', '3', '6'], ['4', '4', '8']];
    const r = ok(build(rows, { resample: 0.5 }));
    expect(Array.from(r.table.time)).toEqual([0, 0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4]);
    expect(Array.from(r.table.angle!)).toEqual([0, 0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4]);
    expect(r.table.torque![3]).toBe(3);
    expect(r.report.resampled).toEqual({ step: 0.5, samplesBefore: 4, samplesAfter: 9, method: 'linear' });
    expect(r.report.samples).toBe(9);
    const median = ok(build(rows, { resample: 'median' }));
    expect(median.report.resampled?.step).toBe(1);
    expect(Array.from(median.table.time)).toEqual([0, 1, 2, 3, 4]);
  });

  it('refuses a resampling that would exceed the sample limit or leave one sample', () => {
    const rows = [['time', 'angle'], ['0', '0'], ['1', '1'], ['2', '2']];
    expect(refusal(build(rows, { resample: 1e-3, maxSamples: 100 })).reason).toContain('would make 2001 samples');
    expect(refusal(build(rows, { resample: 5 })).reason).toContain('fewer than two samples');
  });

  it('refuses a log over the sample limit, naming the row', () => {
    const rows = [['time', 'angle'], ...Array.from({ length: 10 }, (_, i) => [String(i), '0'])];
    expect(refusal(build(rows, { maxSamples: 5 }))).toEqual({ row: 7, column: null, reason: 'the log has more than 5 samples, the most one log may hold' });
  });

  it('refuses an empty log, a header alone and a single sample', () => {
    expect(refusal(build([])).reason).toBe('the log is empty');
    expect(refusal(build([[''], ['']])).reason).toBe('the log has only blank rows');
    expect(refusal(build([['time', 'angle']])).reason).toContain('no data rows');
    expect(refusal(build([['time', 'angle'], ['0', '1']])).reason).toContain('one sample');
  });
});

describe('log builder: its life', () => {
  it('keeps the first rows as text for a preview, even when it refuses', () => {
    const r = build([['time', 'angle'], ['0', '1'], ['1', 'x'.repeat(100)]]);
    expect(r.ok).toBe(false);
    expect(r.detected.firstRows).toEqual([['time', 'angle'], ['0', '1'], ['1', `${'x'.repeat(64)}…`]]);
    expect(r.detected.mapping?.columns.map((c) => c.signal)).toEqual(['time', 'angle']);
  });

  it('answers every push after a refusal with that refusal, and takes nothing after finish', () => {
    const builder = createLogBuilder();
    builder.push(['time', 'angle'], 1);
    const first = builder.push(['x', '1'], 2);
    expect(first.ok).toBe(false);
    expect(builder.push(['1', '1'], 3)).toEqual(first);
    const other = createLogBuilder();
    for (const [i, row] of [['t', 'angle'], ['0', '0'], ['1', '1']].entries()) other.push(row, i + 1);
    expect(other.finish().ok).toBe(true);
    expect(other.push(['2', '2'], 4)).toMatchObject({ ok: false });
    expect(other.finish().ok).toBe(false);
  });

  it('numbers rows itself when the caller gives no usable row number', () => {
    const builder = createLogBuilder();
    builder.push(['t', 'angle'], Number.NaN);
    expect(builder.push(['0', 'y'], -4)).toEqual({ ok: false, error: { row: 2, column: 'column 2 ("angle")', reason: '"y" is not a number' } });
  });
});
