import { createReadStream } from 'node:fs';
import { Readable, pipeline } from 'node:stream';
import { parse, type Info } from 'csv-parse';
import { BOM_NOTE, createLogBuilder, type LogDetected, type LogReport, type LogTable } from '../../shared/calibration/log-builder';
import type { LogError } from '../../shared/calibration/log-mapping';
import type { LogReadOptionsInput } from '../../shared/calibration/log-options';
import { detectSeparator, lineEndingOf, type LogSeparator } from '../../shared/calibration/log-separator';

/**
 * Reads a CSV log from a file or a stream through csv-parse into the log builder, one record at
 * a time, so the text of a 50 MB file is never held whole: what stays is the mapped signals as
 * Float64 (8 bytes a value). The first bytes are looked at to choose the separator, then passed
 * on to the parser unchanged.
 */

/** Bytes of the head the separator is chosen from (or fewer, at the end of the file). */
export const LOG_HEAD_BYTES = 64 * 1024;
/** Longest record csv-parse accepts: a joint-trace row is tens of bytes; a runaway quote is not. */
export const LOG_MAX_RECORD_BYTES = 64 * 1024;

/** How the file itself was written, beside the builder's report. */
export interface LogFileFacts {
  separator: LogSeparator;
  lineEnding: 'crlf' | 'lf' | 'cr' | null;
  /** Bytes read from the source (all of it when the read succeeded). */
  bytes: number;
}

export type LogFileReport = LogReport & { file: LogFileFacts };

export type ReadLogFileResult =
  | { ok: true; table: LogTable; report: LogFileReport; detected: LogDetected }
  | { ok: false; error: LogError; detected: LogDetected | null };

const UTF16_BOMS = [Buffer.from([0xff, 0xfe]), Buffer.from([0xfe, 0xff])];

/** The csv-parse error codes worth a message of our own; others keep csv-parse's words. */
function parserReason(err: { code?: unknown; message?: unknown }): string {
  switch (err.code) {
    case 'CSV_MAX_RECORD_SIZE':
      return `a record is longer than ${LOG_MAX_RECORD_BYTES} bytes (an unclosed quote, or not a log)`;
    case 'CSV_QUOTE_NOT_CLOSED':
      return 'a quoted cell is never closed';
    case 'CSV_INVALID_CLOSING_QUOTE':
      return 'a closing quote is followed by text other than a separator';
    default:
      return `the CSV could not be read: ${String(err.message ?? err).slice(0, 200)}`;
  }
}

/** Resolves with the head (up to LOG_HEAD_BYTES) and an iterator positioned after it. */
async function readHead(iterator: AsyncIterator<Buffer | string>): Promise<{ head: Buffer; done: boolean }> {
  const parts: Buffer[] = [];
  let size = 0;
  while (size < LOG_HEAD_BYTES) {
    const next = await iterator.next();
    if (next.done) return { head: Buffer.concat(parts), done: true };
    const chunk = typeof next.value === 'string' ? Buffer.from(next.value) : next.value;
    parts.push(chunk);
    size += chunk.length;
  }
  return { head: Buffer.concat(parts), done: false };
}

/**
 * A log file (path) or stream read into SI samples and a report, or the first refusal naming
 * its row, column and reason. Never rejects: a missing file or a broken stream is a refusal too.
 * The stream is consumed (and destroyed on refusal).
 */
export async function readLogFile(source: string | Readable, options: LogReadOptionsInput = {}): Promise<ReadLogFileResult> {
  const builder = createLogBuilder(options);
  const input = typeof source === 'string' ? createReadStream(source) : source;
  const iterator = input[Symbol.asyncIterator]() as AsyncIterator<Buffer | string>;
  let bytes = 0;
  try {
    const { head, done } = await readHead(iterator);
    bytes += head.length;
    if (UTF16_BOMS.some((bom) => head.subarray(0, 2).equals(bom))) {
      input.destroy();
      return { ok: false, error: { row: 1, column: null, reason: 'the file is UTF-16; save it as UTF-8 (or plain ASCII) text' }, detected: null };
    }
    const bomRemoved = head.subarray(0, 3).equals(Buffer.from([0xef, 0xbb, 0xbf]));
    const headText = head.toString('utf8');
    const asked = options.separator ?? 'auto';
    const separator = asked === 'auto' ? detectSeparator(headText) : asked;
    if (separator === null) {
      input.destroy();
      return { ok: false, error: { row: 1, column: null, reason: 'no separator found: the first lines do not agree on a comma, semicolon or tab between columns' }, detected: null };
    }
    const lineEnding = lineEndingOf(headText);

    async function* whole(): AsyncGenerator<Buffer> {
      yield head;
      if (done) return;
      for (;;) {
        const next = await iterator.next();
        if (next.done) return;
        const chunk = typeof next.value === 'string' ? Buffer.from(next.value) : next.value;
        bytes += chunk.length;
        yield chunk;
      }
    }
    const parser = parse({ delimiter: separator, bom: true, info: true, relax_column_count: true, relax_quotes: true, max_record_size: LOG_MAX_RECORD_BYTES, skip_empty_lines: false });
    // pipeline destroys the file stream when the parser stops (a refusal below, or an error).
    const records = pipeline(Readable.from(whole()), parser, () => {});
    try {
      for await (const { record, info } of records as AsyncIterable<{ record: string[]; info: Info }>) {
        const pushed = builder.push(record, info.lines);
        if (!pushed.ok) {
          parser.destroy();
          input.destroy();
          return { ok: false, error: pushed.error, detected: builder.detected() };
        }
      }
    } catch (err) {
      input.destroy();
      const e = err as { code?: unknown; lines?: unknown; message?: unknown };
      if (typeof e.code === 'string' && e.code.startsWith('CSV_')) {
        return { ok: false, error: { row: typeof e.lines === 'number' ? e.lines : null, column: null, reason: parserReason(e) }, detected: builder.detected() };
      }
      throw err;
    }
    const built = builder.finish();
    if (!built.ok) return built;
    const report: LogFileReport = { ...built.report, file: { separator, lineEnding, bytes } };
    if (bomRemoved && !report.bomRemoved) {
      report.bomRemoved = true;
      report.notes.unshift(BOM_NOTE);
    }
    return { ok: true, table: built.table, report, detected: built.detected };
  } catch (err) {
    input.destroy();
    const e = err as { code?: unknown; message?: unknown };
    const why = e.code === 'ENOENT' ? 'there is no such file' : e.code === 'EISDIR' ? 'it is a folder' : String(e.message ?? err).slice(0, 200);
    return { ok: false, error: { row: null, column: null, reason: `the log could not be read: ${why}` }, detected: null };
  }
}
