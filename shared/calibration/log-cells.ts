/**
 * One logged cell read as a number. Logs come from many locales: "1.5", "1,5" (a decimal comma,
 * with ';' or tab as the separator), "1e-3", "+2". A cell with both marks or with a thousands
 * separator ("1,234.5", "1.234,5") is refused rather than guessed at.
 */

export type DecimalMark = '.' | ',';

/** Cell texts that mean "no value here", compared lower-cased after trimming. */
const MISSING_TEXTS = new Set(['', 'nan', '-nan', 'na', 'n/a', 'null', 'none', '-', '?']);

const NUMBER_WITH_DOT = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const NUMBER_WITH_COMMA = /^[+-]?(?:\d+(?:,\d*)?|,\d+)(?:[eE][+-]?\d+)?$/;

export type CellValue =
  | { kind: 'number'; value: number; mark: DecimalMark | null }
  | { kind: 'missing' }
  | { kind: 'invalid'; reason: string };

/** Shown text of a cell in a message: quoted, and cut so a huge cell cannot bloat the message. */
export function quoteCell(text: string): string {
  return JSON.stringify(text.length > 40 ? `${text.slice(0, 40)}…` : text);
}

/**
 * The number in a cell. `mark` is the decimal mark the log has used so far (null before the
 * first cell that had one): a cell using the other mark is refused, since "1,500" after "0.5"
 * is a thousands separator, not a decimal comma.
 */
export function readCell(raw: string, mark: DecimalMark | null): CellValue {
  const text = raw.trim();
  if (MISSING_TEXTS.has(text.toLowerCase())) return { kind: 'missing' };
  let used: DecimalMark | null = null;
  let normal = text;
  if (NUMBER_WITH_DOT.test(text)) {
    used = text.includes('.') ? '.' : null;
  } else if (NUMBER_WITH_COMMA.test(text)) {
    used = ',';
    normal = text.replace(',', '.');
  } else if (/^[+-]?inf(inity)?$/i.test(text)) {
    return { kind: 'invalid', reason: `${quoteCell(text)} is not a finite number` };
  } else {
    return { kind: 'invalid', reason: `${quoteCell(text)} is not a number` };
  }
  if (used !== null && mark !== null && used !== mark) {
    return { kind: 'invalid', reason: `${quoteCell(text)} uses "${used}" as its decimal mark, but earlier cells used "${mark}"` };
  }
  const value = Number(normal);
  if (!Number.isFinite(value)) return { kind: 'invalid', reason: `${quoteCell(text)} is outside the range of a double` };
  return { kind: 'number', value, mark: used };
}

/** Whether a cell reads as a number under either mark (for telling a header row from data). */
export function looksNumeric(raw: string): boolean {
  const text = raw.trim();
  return NUMBER_WITH_DOT.test(text) || NUMBER_WITH_COMMA.test(text);
}
