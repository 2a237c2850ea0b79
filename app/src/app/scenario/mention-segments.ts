import { mentionedEmails } from '@kinetwin/shared/library/mentions';

/** A run of a comment's text: plain, or an "@email" mention of a teammate the server resolved. */
export interface TextSegment {
  text: string;
  mention: boolean;
}

function escapeForPattern(text: string): string {
  return text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}

/**
 * Splits a comment body into plain text and mentions. Mentions are found by the same rule the
 * server applies (shared/library/mentions.ts); when `resolved` is given, only addresses in it are
 * marked, since the server treats an address outside the team as plain text.
 * @example mentionSegments('ping @ana@lab.test now')
 * // [{ text: 'ping ', mention: false }, { text: '@ana@lab.test', mention: true }, { text: ' now', mention: false }]
 */
export function mentionSegments(body: string, resolved?: ReadonlySet<string>): TextSegment[] {
  const emails = mentionedEmails(body).filter((email) => !resolved || resolved.has(email));
  if (emails.length === 0) return body ? [{ text: body, mention: false }] : [];
  // Longest first, so "@bo@lab.test" never claims part of "@bo@lab.test.org"-like neighbours.
  const alternatives = [...emails].sort((a, b) => b.length - a.length).map(escapeForPattern);
  const pattern = new RegExp(`(^|[\\s(])(@(?:${alternatives.join('|')}))(?![a-z0-9.-]*[a-z0-9])`, 'gi');
  const segments: TextSegment[] = [];
  let at = 0;
  for (const match of body.matchAll(pattern)) {
    const start = match.index + match[1]!.length;
    if (start > at) segments.push({ text: body.slice(at, start), mention: false });
    segments.push({ text: match[2]!, mention: true });
    at = start + match[2]!.length;
  }
  if (at < body.length) segments.push({ text: body.slice(at), mention: false });
  return segments;
}
