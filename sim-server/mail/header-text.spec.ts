import { describe, expect, it } from 'vitest';
import { headerText } from './header-text';

describe('headerText', () => {
  it('turns CR, LF and CRLF into one space, so no text can start a header of its own (RFC 5322 §2.2)', () => {
    expect(headerText('Axis\r\nBcc: all@example.test')).toBe('Axis Bcc: all@example.test');
    expect(headerText('a\rb\nc\r\n\r\nd')).toBe('a b c d');
    expect(headerText('Ada\r\n')).toBe('Ada');
  });

  it('removes the other line breaks and control characters too', () => {
    expect(headerText('a\u2028b\u2029c\u0085d\u000be\u000cf\u0000g\u007fh')).toBe('a b c d e f g h');
    expect(headerText('tab\there')).toBe('tab here');
  });

  it('keeps ordinary text, quotes and other scripts as they are', () => {
    for (const text of ['Inès Moreau handed you "Wrist pitch"', 'Tomás Varga (demo lead)', '关节 😀']) expect(headerText(text)).toBe(text);
  });
});
