import type { FieldError } from './field-errors';

/**
 * One rule for every text that enters from outside (HTTP bodies and query strings, socket
 * payloads): text PostgreSQL cannot store is refused at the edge with the field named, instead of
 * failing deep in a query as a server error.
 *
 * - U+0000 (NUL): PostgreSQL text types cannot hold the character with code zero (PostgreSQL 15
 *   manual §8.3), and jsonb refuses the escape \u0000 (§8.14).
 * - A lone UTF-16 surrogate (U+D800–U+DFFF without its partner): it has no UTF-8 form (RFC 3629
 *   §3), so jsonb refuses its \uD800 escape and a text column would silently get U+FFFD instead.
 * - Nesting deeper than MAX_INPUT_DEPTH: no document of ours nests that deep, and walking or
 *   storing an arbitrarily deep value costs stack on both sides (common practice).
 */

/** Deepest nesting of objects and arrays accepted in one input; a scenario document needs about 5. */
export const MAX_INPUT_DEPTH = 32;

/** Longest key or path shown in a message; a hostile key can be as long as the body. */
const MAX_SHOWN_KEY = 40;

// Without the u flag a regex sees UTF-16 code units, which is what lets it find lone halves.
const UNSAFE_CHARACTER = /\u0000|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** Why one string cannot be stored, or null when it can. */
export function unsafeTextReason(text: string): string | null {
  const found = UNSAFE_CHARACTER.exec(text);
  if (!found) return null;
  if (found[0] === '\u0000') return 'contains a NUL character (U+0000), which cannot be stored';
  const unit = found[0].charCodeAt(0).toString(16).toUpperCase();
  return `contains a lone surrogate (U+${unit}), which is not valid Unicode text`;
}

/** A key as it may appear in a message: unsafe characters escaped, long keys cut. */
function shownKey(key: string): string {
  const escaped = key.replace(new RegExp(UNSAFE_CHARACTER.source, 'g'), (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
  return escaped.length > MAX_SHOWN_KEY ? `${escaped.slice(0, MAX_SHOWN_KEY)}…` : escaped;
}

interface Pending {
  value: unknown;
  path: string[];
  depth: number;
  /** Set when the key that leads here is itself unsafe. */
  keyReason?: string;
}

/**
 * The first string or key in a parsed JSON value (or a query object) that PostgreSQL cannot
 * store, as a field error with the dotted path of the field ("scenario.name", "tags.2"), or null
 * when every text is safe. Walks with an explicit stack, so a deeply nested input cannot exhaust
 * the call stack; values other than strings, arrays and objects are left to the schemas.
 * @example findUnsafeText({ tags: ['ok', 'x\u0000'] }) // { field: 'tags.1', message: 'tags.1 contains a NUL character (U+0000), which cannot be stored' }
 */
export function findUnsafeText(input: unknown): FieldError | null {
  const stack: Pending[] = [{ value: input, path: [], depth: 0 }];
  while (stack.length > 0) {
    const { value, path, depth, keyReason } = stack.pop()!;
    if (keyReason) return refusal(path, `is a key that ${keyReason}`);
    if (typeof value === 'string') {
      const reason = unsafeTextReason(value);
      if (reason) return refusal(path, reason);
      continue;
    }
    if (value === null || typeof value !== 'object') continue;
    if (depth >= MAX_INPUT_DEPTH) return refusal(path, `nests objects or arrays deeper than ${MAX_INPUT_DEPTH} levels`);
    const entries = Array.isArray(value) ? value.map((item, i) => [String(i), item] as const) : Object.entries(value);
    // Pushed in reverse so the first field in document order is reported first.
    for (let i = entries.length - 1; i >= 0; i--) {
      const [key, item] = entries[i]!;
      const keyReason = unsafeTextReason(key) ?? undefined;
      stack.push({ value: item, path: [...path, shownKey(key)], depth: depth + 1, keyReason });
    }
  }
  return null;
}

function refusal(path: readonly string[], reason: string): FieldError {
  const field = path.join('.');
  return { field, message: `${field || 'value'} ${reason}` };
}
