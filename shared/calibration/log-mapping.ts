import { quoteCell } from './log-cells';
import { signalOfHeader, unitOfHeader } from './log-header';
import type { ColumnRef, LogReadOptions } from './log-options';
import { DEFAULT_LOG_UNITS, LOG_SIGNALS, MEASURED_SIGNALS, siFactor, UNITS_OF, type LogSignal, type LogUnit } from './log-signals';

/** Where a column's signal or unit came from: the user, the header's words, or the default. */
export type MappingSource = 'given' | 'header' | 'position' | 'default';

/** One signal's column as it will be read. */
export interface MappedColumn {
  signal: LogSignal;
  /** Zero-based position in each row. */
  index: number;
  /** Header text, or null for a log without a header. */
  name: string | null;
  columnSource: MappingSource;
  unit: LogUnit;
  unitSource: MappingSource;
  /** Multiplies a logged value to SI. */
  factor: number;
}

/** The mapping of a log, in LOG_SIGNALS order; time is always first. */
export interface LogMapping {
  columns: MappedColumn[];
  countsPerRev: number | null;
}

/** A refusal naming the row, the column and the problem (row 1-based as an editor shows it; null when it is the whole log). */
export interface LogError {
  row: number | null;
  column: string | null;
  reason: string;
}

/** How a column is named in messages: its header text, or its position counted from 1. */
export function columnLabel(index: number, header: readonly string[] | null): string {
  const name = header?.[index];
  return name ? `column ${index + 1} (${quoteCell(name)})` : `column ${index + 1}`;
}

function resolveRef(ref: ColumnRef, header: readonly string[] | null, width: number, signal: LogSignal, row: number): number | LogError {
  if (typeof ref === 'number') {
    if (ref >= width) return { row, column: null, reason: `${signal} is mapped to column ${ref + 1}, but the rows have ${width} column${width === 1 ? '' : 's'}` };
    return ref;
  }
  if (header === null) return { row, column: null, reason: `${signal} is mapped to the header ${quoteCell(ref)}, but the log has no header row; map it by position` };
  const wanted = ref.trim().toLowerCase();
  const index = header.findIndex((h) => h.trim().toLowerCase() === wanted);
  if (index < 0) return { row, column: null, reason: `${signal} is mapped to ${quoteCell(ref)}, which is not a header of this log (${header.slice(0, 12).map(quoteCell).join(', ')})` };
  return index;
}

/**
 * The mapping for a log whose first row is `first` (already cut of BOM and line ends), or a
 * refusal. `header` is that row when it is a header, else null; `width` is its cell count.
 */
export function resolveMapping(header: readonly string[] | null, width: number, options: LogReadOptions, row: number): LogMapping | LogError {
  const chosen = new Map<LogSignal, { index: number; source: MappingSource }>();
  if (options.columns !== undefined) {
    for (const signal of LOG_SIGNALS) {
      const ref = options.columns[signal];
      if (ref === undefined) continue;
      const index = resolveRef(ref, header, width, signal, row);
      if (typeof index !== 'number') return index;
      chosen.set(signal, { index, source: 'given' });
    }
  } else if (header !== null) {
    const taken = new Set<number>();
    // Each signal takes the first column whose header names it, in the detection order of log-header.ts.
    header.forEach((name, index) => {
      const signal = signalOfHeader(name);
      if (signal !== null && !chosen.has(signal) && !taken.has(index)) {
        chosen.set(signal, { index, source: 'header' });
        taken.add(index);
      }
    });
  } else {
    // No header and no mapping: the commonest layout, time then angle.
    if (width >= 2) {
      chosen.set('time', { index: 0, source: 'position' });
      chosen.set('angle', { index: 1, source: 'position' });
    }
  }

  if (!chosen.has('time')) {
    const where = header === null ? 'the log has no header to find it by' : `no header names it (${header.slice(0, 12).map(quoteCell).join(', ')})`;
    return { row, column: null, reason: `no time column: ${where}; map time to a column` };
  }
  if (!MEASURED_SIGNALS.some((s) => chosen.has(s))) {
    return { row, column: null, reason: `no signal column besides time: map at least one of ${MEASURED_SIGNALS.join(', ')}` };
  }
  const byIndex = new Map<number, LogSignal>();
  for (const [signal, { index }] of chosen) {
    const other = byIndex.get(index);
    if (other !== undefined) return { row, column: columnLabel(index, header), reason: `${other} and ${signal} are both mapped to this column` };
    byIndex.set(index, signal);
  }

  const countsPerRev = options.countsPerRev ?? null;
  const columns: MappedColumn[] = [];
  for (const signal of LOG_SIGNALS) {
    const pick = chosen.get(signal);
    if (!pick) continue;
    const name = header?.[pick.index] ?? null;
    const given = options.units?.[signal];
    const fromHeader = name === null ? null : unitOfHeader(name, UNITS_OF[signal]);
    const unit: LogUnit = given ?? fromHeader ?? DEFAULT_LOG_UNITS[signal];
    const unitSource: MappingSource = given !== undefined ? 'given' : fromHeader !== null ? 'header' : 'default';
    const factor = siFactor(unit, countsPerRev);
    if (factor === null) return { row, column: columnLabel(pick.index, header), reason: `${signal} is in encoder counts: give countsPerRev (counts per revolution of the joint)` };
    columns.push({ signal, index: pick.index, name, columnSource: pick.source, unit, unitSource, factor });
  }
  return { columns, countsPerRev };
}
