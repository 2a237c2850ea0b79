import { describe, expect, it } from 'vitest';
import { MAX_MENTIONS, mentionedEmails } from './mentions';

describe('mentionedEmails', () => {
  it('finds mentions at the start, after spaces and brackets, without the closing dot', () => {
    expect(mentionedEmails('@ana@lab.test please check (cc @Bo.Li@lab.example.org). Thanks @ana@lab.test.')).toEqual(['ana@lab.test', 'bo.li@lab.example.org']);
  });

  it('ignores plain addresses, mid-word at-signs and broken addresses', () => {
    expect(mentionedEmails('mail ana@lab.test or x@ana@lab.test or @ana@lab or @@ana@lab.test')).toEqual([]);
  });

  it('caps the number of mentions', () => {
    const body = Array.from({ length: MAX_MENTIONS + 5 }, (_, i) => `@p${i}@lab.test`).join(' ');
    expect(mentionedEmails(body)).toHaveLength(MAX_MENTIONS);
  });
});
