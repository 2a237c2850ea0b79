import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { findUnsafeText, MAX_INPUT_DEPTH, unsafeTextReason } from './unsafe-text';

describe('unsafeTextReason', () => {
  it('accepts ordinary text, emoji (a surrogate pair) and other scripts', () => {
    for (const text of ['', 'Wrist pitch', 'über Ωmega', '关节', 'tuned 😀 today', '\ud83d\ude00', 'tab\tand\nnewline']) expect(unsafeTextReason(text), text).toBeNull();
  });

  it('refuses NUL anywhere in the text (PostgreSQL 15 manual §8.3)', () => {
    for (const text of ['\u0000', 'x\u0000', '\u0000x', 'a\u0000b']) expect(unsafeTextReason(text)).toMatch(/NUL character \(U\+0000\)/);
  });

  it('refuses a lone high or low surrogate, wherever it sits (RFC 3629 §3)', () => {
    expect(unsafeTextReason('\ud800')).toMatch(/lone surrogate \(U\+D800\)/);
    expect(unsafeTextReason('x\udfff')).toMatch(/lone surrogate \(U\+DFFF\)/);
    expect(unsafeTextReason('\ude00\ud83d')).toMatch(/lone surrogate \(U\+DE00\)/);
    expect(unsafeTextReason('ok \ud83d\ude00 then \udbff')).toMatch(/U\+DBFF/);
  });

  it('agrees with a UTF-8 round trip and the NUL rule on any string (fast-check)', () => {
    // Any sequence of UTF-16 code units (lone halves included), mixed with well-formed code points.
    const unit = fc.oneof(fc.integer({ min: 0, max: 0xffff }).map((u) => String.fromCharCode(u)), fc.string({ unit: 'binary', minLength: 1, maxLength: 1 }));
    fc.assert(
      fc.property(fc.string({ unit }), (text) => {
        const roundTrips = new TextDecoder().decode(new TextEncoder().encode(text)) === text;
        expect(unsafeTextReason(text) === null).toBe(roundTrips && !text.includes('\u0000'));
      }),
      { seed: 9016, numRuns: 500 },
    );
  });
});

describe('findUnsafeText', () => {
  it('finds nothing in a clean document, whatever the values', () => {
    expect(findUnsafeText({ name: 'Axis', tags: ['a', 'b'], n: 3, ok: true, none: null, joint: { inertia: 0.2 } })).toBeNull();
    expect(findUnsafeText(undefined)).toBeNull();
    expect(findUnsafeText(42)).toBeNull();
  });

  it('names the dotted path of the first unsafe string', () => {
    expect(findUnsafeText({ scenario: { name: 'x\u0000' } })).toEqual({ field: 'scenario.name', message: 'scenario.name contains a NUL character (U+0000), which cannot be stored' });
    expect(findUnsafeText({ tags: ['ok', '\ud800'] })?.field).toBe('tags.1');
    expect(findUnsafeText({ a: 'fine', b: ['\u0000'], c: '\u0000' })?.field).toBe('b.0');
    expect(findUnsafeText('x\u0000')).toEqual({ field: '', message: 'value contains a NUL character (U+0000), which cannot be stored' });
  });

  it('refuses an unsafe key and shows it escaped, never raw', () => {
    const found = findUnsafeText({ joint: { ['bad\u0000key']: 1 } });
    expect(found?.field).toBe('joint.bad\\u0000key');
    expect(found?.message).toMatch(/is a key that contains a NUL character/);
    expect(found?.message).not.toContain('\u0000');
  });

  it('reads query objects without a prototype, as node:querystring makes them', () => {
    const query = Object.assign(Object.create(null), { q: '\u0000', page: '1' }) as Record<string, unknown>;
    expect(findUnsafeText(query)?.field).toBe('q');
  });

  it('refuses nesting past the limit without exhausting the stack', () => {
    let deep: unknown = 'leaf';
    for (let i = 0; i < 100_000; i++) deep = [deep];
    expect(findUnsafeText(deep)?.message).toContain(`deeper than ${MAX_INPUT_DEPTH} levels`);
    let justDeepEnough: unknown = 'leaf';
    for (let i = 0; i < MAX_INPUT_DEPTH; i++) justDeepEnough = { a: justDeepEnough };
    expect(findUnsafeText(justDeepEnough)).toBeNull();
  });
});
