import { looksNumeric, quoteCell, readCell, type DecimalMark } from './log-cells';
import { columnLabel, resolveMapping, type LogError, type LogMapping, type MappingSource } from './log-mapping';
import { LOG_MAX_ABS_TIME, LOG_MAX_COLUMNS, LOG_PREVIEW_ROWS, logReadOptionsSchema, type LogReadOptions, type LogReadOptionsInput } from './log-options';
import { gridLength, interpolateLinear, uniformGrid } from './log-resample';
import { SampleBuffer } from './log-sample-buffer';
import type { LogSignal, LogUnit, MeasuredSignal } from './log-signals';
import { gapsOf, timingOf, type LogTiming } from './log-timing';

/**
 * The log normaliser: rows go in one at a time as cells of text (from csv-parse, a test, or any
 * other reader), and a table of SI samples and a report come out — or a refusal naming the row,
 * the column and the problem. It holds only the mapped signals as Float64, never the text.
 */

/** A log's samples in SI: time in s, angles in rad, velocity in rad/s, torque in N·m. */
export type LogTable = { time: Float64Array } & Partial<Record<MeasuredSignal, Float64Array>>;

/** Rows listed in the report by example; the count is always complete. */
export const REPORT_ROW_EXAMPLES = 20;

export interface RowCount {
  count: number;
  /** The first REPORT_ROW_EXAMPLES rows concerned. */
  rows: number[];
}

export interface ReportedGap {
  /** Rows of the samples either side of the gap. */
  fromRow: number;
  toRow: number;
  step: number;
}

export interface ReportedColumn {
  signal: LogSignal;
  index: number;
  name: string | null;
  columnSource: MappingSource;
  unit: LogUnit;
  unitSource: MappingSource;
}

/** What was read and what was done to it; stored with the log. */
export interface LogReport {
  /** Data rows read (header and blank rows not counted), skipped and dropped ones included. */
  rows: number;
  /** Samples in the table (after resampling, when asked). */
  samples: number;
  header: string[] | null;
  columns: ReportedColumn[];
  countsPerRev: number | null;
  decimalMark: DecimalMark | null;
  bomRemoved: boolean;
  blankRows: number;
  /** Rows dropped for an empty or NaN cell (missing: "skip-row"). */
  skippedRows: RowCount;
  /** Rows dropped for repeating the previous time (duplicateTimes: "keep-first"). */
  duplicateTimes: RowCount;
  /** Spacing of the samples as logged, in s. */
  timing: LogTiming;
  gaps: { count: number; first: ReportedGap[] };
  resampled: null | { step: number; samplesBefore: number; samplesAfter: number; method: 'linear' };
  /** One sentence per thing handled, for the preview and the stored record. */
  notes: string[];
}

/** What the builder had found when it stopped: enough for a mapping step to show and correct. */
export interface LogDetected {
  header: string[] | null;
  mapping: LogMapping | null;
  /** The first LOG_PREVIEW_ROWS rows as text, header included, cells cut to 64 characters. */
  firstRows: string[][];
}

export type LogPushResult = { ok: true } | { ok: false; error: LogError };
export type LogBuildResult = { ok: true; table: LogTable; report: LogReport; detected: LogDetected } | { ok: false; error: LogError; detected: LogDetected };

export interface LogBuilder {
  /** One record's cells; `rowNumber` is its 1-based line in the file, used in messages. */
  push(cells: readonly string[], rowNumber: number): LogPushResult;
  /** The table and report, or the refusal; the builder takes no rows after it. */
  finish(): LogBuildResult;
  /** What has been found so far (for a caller that stops early). */
  detected(): LogDetected;
}

const BOM = '\uFEFF';
/** The report's words for a removed byte-order mark (the file reader adds them when csv-parse removed it). */
export const BOM_NOTE = 'A byte-order mark at the start was removed.';
const PREVIEW_CELL = 64;

/** Trims a cell of spaces and any carriage return a CRLF file left behind. */
function cleanCell(cell: unknown): string {
  return (typeof cell === 'string' ? cell : cell === undefined || cell === null ? '' : String(cell)).replace(/\r/g, '').trim();
}

function noted(count: RowCount, row: number): void {
  count.count++;
  if (count.rows.length < REPORT_ROW_EXAMPLES) count.rows.push(row);
}

function formatSeconds(value: number): string {
  return `${Number(value.toPrecision(6))} s`;
}

/** Options checked and defaulted, or a refusal naming the option. */
export function logOptions(input: LogReadOptionsInput | undefined): { ok: true; options: LogReadOptions } | { ok: false; error: LogError } {
  const parsed = logReadOptionsSchema.safeParse(input ?? {});
  if (parsed.success) return { ok: true, options: parsed.data };
  const issue = parsed.error.issues[0]!;
  return { ok: false, error: { row: null, column: null, reason: `option ${issue.path.map(String).join('.') || '(options)'}: ${issue.message}` } };
}

/** A builder for one log. Options are parsed here too, so a caller that skipped zod still gets a refusal, not a throw. */
export function createLogBuilder(input?: LogReadOptionsInput): LogBuilder {
  const checked = logOptions(input);
  const options: LogReadOptions = checked.ok ? checked.options : logReadOptionsSchema.parse({});
  let failure: LogError | null = checked.ok ? null : checked.error;
  let finished = false;

  let header: string[] | null = null;
  let mapping: LogMapping | null = null;
  let mark: DecimalMark | null = options.decimalMark === 'auto' ? null : options.decimalMark;
  let bomRemoved = false;
  let firstRecord = true;
  let rows = 0;
  let blankRows = 0;
  let fallbackRow = 0;
  const skippedRows: RowCount = { count: 0, rows: [] };
  const duplicateTimes: RowCount = { count: 0, rows: [] };
  const firstRows: string[][] = [];
  const buffers = new Map<LogSignal, SampleBuffer>();
  // Row numbers of samples, kept sparsely: a sample's row is the last entry's row plus its distance from it.
  const rowMarks: { index: number; row: number }[] = [];
  let lastRow = Number.NaN;
  let samples = 0;

  const fail = (error: LogError): LogPushResult => {
    failure = error;
    return { ok: false, error };
  };
  const detected = (): LogDetected => ({ header, mapping, firstRows });

  function rowOfSample(index: number): number {
    let lo = 0;
    let hi = rowMarks.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >>> 1;
      if (rowMarks[mid]!.index <= index) lo = mid;
      else hi = mid - 1;
    }
    const at = rowMarks[lo]!;
    return at.row + (index - at.index);
  }

  function push(rawCells: readonly string[], rowNumber: number): LogPushResult {
    if (failure) return { ok: false, error: failure };
    if (finished) return fail({ row: null, column: null, reason: 'the log was already finished; no more rows are taken' });
    fallbackRow++;
    const row = Number.isSafeInteger(rowNumber) && rowNumber > 0 ? rowNumber : fallbackRow;
    if (!Array.isArray(rawCells)) return fail({ row, column: null, reason: 'the row is not a list of cells' });
    if (rawCells.length > LOG_MAX_COLUMNS) return fail({ row, column: null, reason: `the row has ${rawCells.length} cells; a log has at most ${LOG_MAX_COLUMNS} columns` });
    // Checked before cleaning: String.prototype.trim counts U+FEFF as white space and would hide it.
    if (firstRecord && typeof rawCells[0] === 'string' && rawCells[0].startsWith(BOM)) bomRemoved = true;
    const cells = rawCells.map(cleanCell);
    firstRecord = false;
    if (cells.every((c) => c === '')) {
      blankRows++;
      return { ok: true };
    }
    if (firstRows.length < LOG_PREVIEW_ROWS) firstRows.push(cells.map((c) => (c.length > PREVIEW_CELL ? `${c.slice(0, PREVIEW_CELL)}…` : c)));

    if (mapping === null) {
      const isHeader = options.header === 'present' || (options.header === 'auto' && cells.some((c) => c !== '' && !looksNumeric(c)));
      header = isHeader ? cells : null;
      const resolved = resolveMapping(header, cells.length, options, row);
      if ('reason' in resolved) return fail(resolved);
      mapping = resolved;
      for (const column of mapping.columns) buffers.set(column.signal, new SampleBuffer());
      if (isHeader) return { ok: true };
    }

    rows++;
    const values: number[] = [];
    for (const column of mapping.columns) {
      const label = columnLabel(column.index, header);
      const cell = readCell(cells[column.index] ?? '', mark);
      if (cell.kind === 'invalid') return fail({ row, column: label, reason: cell.reason });
      if (cell.kind === 'missing') {
        if (options.missing === 'skip-row') {
          noted(skippedRows, row);
          return { ok: true };
        }
        const text = cells[column.index];
        const what = text === undefined ? 'the row ends before this column' : text === '' ? 'the cell is empty' : `${quoteCell(text)} is not a value`;
        return fail({ row, column: label, reason: `${what} (missing: "skip-row" drops such rows)` });
      }
      if (cell.mark !== null && mark === null) mark = cell.mark;
      const si = cell.value * column.factor;
      if (!Number.isFinite(si)) return fail({ row, column: label, reason: `${quoteCell(cells[column.index]!)} ${column.unit} is out of range in SI` });
      if (column.signal === 'time' && Math.abs(si) > LOG_MAX_ABS_TIME) {
        return fail({ row, column: label, reason: `time ${formatSeconds(si)} is beyond ±${LOG_MAX_ABS_TIME} s; log time from the start of the run, not as a clock time` });
      }
      values.push(si);
    }

    const time = values[0]!;
    if (samples > 0) {
      const previous = buffers.get('time')!.last();
      const timeLabel = columnLabel(mapping.columns[0]!.index, header);
      if (time < previous) return fail({ row, column: timeLabel, reason: `time ${formatSeconds(time)} goes back from ${formatSeconds(previous)} on row ${lastRow}; times must increase` });
      if (time === previous) {
        if (options.duplicateTimes === 'keep-first') {
          noted(duplicateTimes, row);
          return { ok: true };
        }
        return fail({ row, column: timeLabel, reason: `time ${formatSeconds(time)} repeats row ${lastRow}'s (duplicateTimes: "keep-first" keeps the first)` });
      }
    }
    if (samples >= options.maxSamples) return fail({ row, column: null, reason: `the log has more than ${options.maxSamples} samples, the most one log may hold` });
    mapping.columns.forEach((column, i) => buffers.get(column.signal)!.push(values[i]!));
    if (row !== lastRow + 1) rowMarks.push({ index: samples, row });
    lastRow = row;
    samples++;
    return { ok: true };
  }

  function finish(): LogBuildResult {
    if (failure) return { ok: false, error: failure, detected: detected() };
    if (finished) return { ok: false, error: { row: null, column: null, reason: 'the log was already finished' }, detected: detected() };
    finished = true;
    if (mapping === null) {
      failure = { row: null, column: null, reason: blankRows > 0 ? 'the log has only blank rows' : 'the log is empty' };
      return { ok: false, error: failure, detected: detected() };
    }
    if (samples < 2) {
      failure = { row: null, column: null, reason: `the log has ${samples === 0 ? 'no data rows' : 'one sample'}; at least two are needed` };
      return { ok: false, error: failure, detected: detected() };
    }
    const current = mapping;
    const timeLabel = columnLabel(current.columns[0]!.index, header);
    let time = buffers.get('time')!.take();
    const signals = new Map<MeasuredSignal, Float64Array>();
    for (const column of current.columns) if (column.signal !== 'time') signals.set(column.signal, buffers.get(column.signal)!.take());

    const timing = timingOf(time);
    const gaps = gapsOf(time, timing.medianStep, options.gapFactor);
    const reportedGaps = gaps.slice(0, REPORT_ROW_EXAMPLES).map((g) => ({ fromRow: rowOfSample(g.index), toRow: rowOfSample(g.index + 1), step: g.step }));
    if (gaps.length > 0 && options.gaps === 'refuse') {
      const g = reportedGaps[0]!;
      failure = {
        row: g.toRow,
        column: timeLabel,
        reason: `time jumps by ${formatSeconds(g.step)} from row ${g.fromRow}, over ${options.gapFactor} × the median step of ${formatSeconds(timing.medianStep)}${gaps.length > 1 ? ` (${gaps.length} gaps in all)` : ''}; gaps: "allow" keeps them`,
      };
      return { ok: false, error: failure, detected: detected() };
    }

    const notes: string[] = [];
    if (bomRemoved) notes.push(BOM_NOTE);
    if (mark === ',') notes.push('Decimal commas were read as decimal marks.');
    for (const column of current.columns) {
      const where = column.name === null ? `column ${column.index + 1}` : `column ${quoteCell(column.name)}`;
      const how = column.unitSource === 'header' ? ' (from its header)' : column.unitSource === 'default' ? ' (no unit named; SI assumed)' : '';
      notes.push(`${column.signal} from ${where} in ${column.unit}${how}${column.factor === 1 ? '' : ', converted to SI'}.`);
    }
    if (blankRows > 0) notes.push(`${blankRows} blank row${blankRows === 1 ? ' was' : 's were'} skipped.`);
    if (skippedRows.count > 0) notes.push(`${skippedRows.count} row${skippedRows.count === 1 ? '' : 's'} with an empty or NaN cell dropped (first: row ${skippedRows.rows[0]}).`);
    if (duplicateTimes.count > 0) notes.push(`${duplicateTimes.count} row${duplicateTimes.count === 1 ? '' : 's'} repeating the previous time dropped; the first row of each time kept (first: row ${duplicateTimes.rows[0]}).`);
    if (gaps.length > 0) notes.push(`${gaps.length} gap${gaps.length === 1 ? '' : 's'} over ${options.gapFactor} × the median step kept (first after row ${reportedGaps[0]!.fromRow}).`);
    if (!timing.uniform && options.resample === undefined) notes.push(`Sampling is uneven (steps ${formatSeconds(timing.minStep)} to ${formatSeconds(timing.maxStep)}); samples are kept at their logged times.`);

    let resampled: LogReport['resampled'] = null;
    if (options.resample !== undefined) {
      const step = options.resample === 'median' ? timing.medianStep : options.resample;
      const n = gridLength(timing.start, timing.end, step);
      if (n > options.maxSamples) {
        failure = { row: null, column: timeLabel, reason: `resampling at ${formatSeconds(step)} would make ${n} samples, over the ${options.maxSamples} one log may hold` };
        return { ok: false, error: failure, detected: detected() };
      }
      if (n < 2) {
        failure = { row: null, column: timeLabel, reason: `resampling at ${formatSeconds(step)} leaves fewer than two samples over the log's ${formatSeconds(timing.end - timing.start)}` };
        return { ok: false, error: failure, detected: detected() };
      }
      const grid = uniformGrid(timing.start, step, n);
      for (const [signal, values] of signals) signals.set(signal, interpolateLinear(time, values, grid));
      resampled = { step, samplesBefore: time.length, samplesAfter: n, method: 'linear' };
      notes.push(`Resampled by linear interpolation onto a uniform ${formatSeconds(step)} grid: ${time.length} samples became ${n}.`);
      time = grid;
    }

    const table: LogTable = { time };
    for (const [signal, values] of signals) table[signal] = values;
    const report: LogReport = {
      rows,
      samples: time.length,
      header,
      columns: current.columns.map(({ factor: _factor, ...column }) => column),
      countsPerRev: current.countsPerRev,
      decimalMark: mark,
      bomRemoved,
      blankRows,
      skippedRows,
      duplicateTimes,
      timing,
      gaps: { count: gaps.length, first: reportedGaps },
      resampled,
      notes,
    };
    return { ok: true, table, report, detected: detected() };
  }

  return { push, finish, detected };
}
