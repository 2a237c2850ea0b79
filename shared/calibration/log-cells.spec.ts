import { describe, expect, it } from 'vitest';
import { looksNumeric, readCell } from './log-cells';

describe('readCell', () => {
  it('reads dot decimals, exponents and signs', () => {
    expect(readCell('1.5', null)).toEqual({ kind: 'number', value: 1.5, mark: '.' });
    expect(readCell(' -2e-3 ', null)).toEqual({ kind: 'number', value: -0.002, mark: null });
    expect(readCell('+.25', null)).toEqual({ kind: 'number', value: 0.25, mark: '.' });
    expect(readCell('7', '.')).toEqual({ kind: 'number', value: 7, mark: null });
  });

  it('reads a decimal comma', () => {
    expect(readCell('1,5', null)).toEqual({ kind: 'number', value: 1.5, mark: ',' });
    expect(readCell('-0,001E3', ',')).toEqual({ kind: 'number', value: -1, mark: ',' });
  });

  it('refuses a cell using the other decimal mark than the log so far', () => {
    expect(readCell('1,500', '.')).toMatchObject({ kind: 'invalid', reason: expect.stringContaining('earlier cells used "."') });
    expect(readCell('0.5', ',')).toMatchObject({ kind: 'invalid', reason: expect.stringContaining('earlier cells used ","') });
  });

  it('refuses thousands separators, text and infinities', () => {
    expect(readCell('1,234.5', null).kind).toBe('invalid');
    expect(readCell('1.234,5', null).kind).toBe('invalid');
    expect(readCell('12 mm', null)).toMatchObject({ kind: 'invalid', reason: '"12 mm" is not a number' });
    expect(readCell('Infinity', null)).toMatchObject({ kind: 'invalid', reason: expect.stringContaining('not a finite number') });
    expect(readCell('1e400', null)).toMatchObject({ kind: 'invalid', reason: expect.stringContaining('outside the range') });
  });

  it('takes empty, NaN and the usual placeholders as missing', () => {
    for (const text of ['', '  ', 'NaN', 'nan', 'NA', 'n/a', 'null', '-', '?']) expect(readCell(text, null)).toEqual({ kind: 'missing' });
  });

  it('cuts a huge cell in its message', () => {
    const cell = readCell('x'.repeat(10_000), null);
    expect(cell.kind === 'invalid' && cell.reason.length).toBeLessThan(80);
  });

  it('tells numbers from header words', () => {
    expect(looksNumeric('0,5')).toBe(true);
    expect(looksNumeric('3')).toBe(true);
    expect(looksNumeric('time')).toBe(false);
    expect(looksNumeric('')).toBe(false);
  });
});
