import { describe, expect, it } from 'vitest';
import { detectSeparator, headLines, lineEndingOf } from './log-separator';

describe('detectSeparator', () => {
  it('finds comma, semicolon and tab', () => {
    expect(detectSeparator('time,angle\n0,1\n1,2\n')).toBe(',');
    expect(detectSeparator('time;angle\n0;1\n1;2\n')).toBe(';');
    expect(detectSeparator('time\tangle\n0\t1\n1\t2\n')).toBe('\t');
  });

  it('prefers the semicolon when decimal commas put commas on every line too', () => {
    expect(detectSeparator('t;a;b\n0,0;1,5;2,5\n0,1;1,6;2,6\n')).toBe(';');
  });

  it('counts nothing inside quotes', () => {
    expect(detectSeparator('"a;b",c\n"1;2",3\n')).toBe(',');
  });

  it('takes the separator on every line when lines are ragged', () => {
    expect(detectSeparator('t;a;\n0;1\n1;2;\n')).toBe(';');
  });

  it('finds none for a single column or an empty head', () => {
    expect(detectSeparator('time\n0\n1\n')).toBeNull();
    expect(detectSeparator('')).toBeNull();
  });

  it('reads CRLF and CR heads and skips a BOM', () => {
    expect(detectSeparator('\uFEFFt;a\r\n0;1\r\n')).toBe(';');
    expect(headLines('a\rb\rc')).toEqual(['a', 'b']);
    expect(lineEndingOf('a\r\nb')).toBe('crlf');
    expect(lineEndingOf('a\nb')).toBe('lf');
    expect(lineEndingOf('a\rb')).toBe('cr');
    expect(lineEndingOf('a')).toBeNull();
  });
});
