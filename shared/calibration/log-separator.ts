/**
 * The separator of a delimited log, from its first lines: the candidate that appears the same
 * number of times (at least once) on every line, quoted text left out. Semicolon and tab win
 * over comma when more than one fits, since a log with decimal commas ("0,5;1,25") has commas
 * on every line too.
 */

export type LogSeparator = ',' | ';' | '\t';

/** Lines looked at; the first of them may be a header, so at least two are wanted. */
export const SEPARATOR_SAMPLE_LINES = 10;

const PREFERENCE: readonly LogSeparator[] = ['\t', ';', ','];

/** Occurrences of `separator` on a line outside double quotes. */
function countOutsideQuotes(line: string, separator: string): number {
  let n = 0;
  let quoted = false;
  for (const ch of line) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && ch === separator) n++;
  }
  return n;
}

/** The first non-blank lines of a text head (any of LF, CRLF, CR), without their line ends. */
export function headLines(head: string, count = SEPARATOR_SAMPLE_LINES): string[] {
  const lines = head.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  // The last piece may be a line cut off mid-way by the end of the head; it is left out unless it is all there is.
  const complete = lines.length > 1 ? lines.slice(0, -1) : lines;
  return complete.filter((l) => l.trim() !== '').slice(0, count);
}

/** The separator the head's lines agree on, or null when none fits (a single column, or ragged lines). */
export function detectSeparator(head: string): LogSeparator | null {
  const lines = headLines(head);
  if (lines.length === 0) return null;
  for (const candidate of PREFERENCE) {
    const counts = lines.map((l) => countOutsideQuotes(l, candidate));
    if (counts[0]! > 0 && counts.every((c) => c === counts[0])) return candidate;
  }
  // Ragged lines (a trailing separator on some, a short last row): the candidate on every line, the most often.
  let best: LogSeparator | null = null;
  let bestTotal = 0;
  for (const candidate of PREFERENCE) {
    const counts = lines.map((l) => countOutsideQuotes(l, candidate));
    const total = counts.reduce((a, b) => a + b, 0);
    if (counts.every((c) => c > 0) && total > bestTotal) {
      best = candidate;
      bestTotal = total;
    }
  }
  return best;
}

/** How the head's lines end, for the report. */
export function lineEndingOf(head: string): 'crlf' | 'lf' | 'cr' | null {
  if (head.includes('\r\n')) return 'crlf';
  if (head.includes('\n')) return 'lf';
  if (head.includes('\r')) return 'cr';
  return null;
}
