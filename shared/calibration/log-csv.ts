import type { LogTable } from './log-builder';
import { LOG_SIGNALS, SI_UNITS, type LogSignal } from './log-signals';

/**
 * A stored log written back as CSV, a block of rows at a time so a download streams: comma
 * separated, dot decimals, LF, a header naming each signal and its SI unit. Values are printed
 * as the shortest text that reads back to the same double (ECMAScript Number::toString), so a
 * downloaded log uploads again to identical samples.
 */

/** Rows per block handed to the response: ~100 kB of text. */
export const CSV_ROWS_PER_CHUNK = 4096;

/** The header names of the download, e.g. "time [s]"; the reader's header detection reads them back. */
export function csvHeaderOf(signal: LogSignal): string {
  return `${signal} [${SI_UNITS[signal]}]`;
}

export function* logCsvChunks(table: LogTable, rowsPerChunk = CSV_ROWS_PER_CHUNK): Generator<string> {
  const columns = LOG_SIGNALS.flatMap((signal) => {
    const values = table[signal];
    return values ? [{ signal, values }] : [];
  });
  yield `${columns.map((c) => csvHeaderOf(c.signal)).join(',')}\n`;
  const n = table.time.length;
  for (let start = 0; start < n; start += rowsPerChunk) {
    const end = Math.min(n, start + rowsPerChunk);
    let text = '';
    for (let i = start; i < end; i++) {
      for (let c = 0; c < columns.length; c++) text += (c === 0 ? '' : ',') + String(columns[c]!.values[i]);
      text += '\n';
    }
    yield text;
  }
}
