/** A piece of a mail's text: plain text, or a web address to show as a link. */
export type MailSegment = { kind: 'text'; text: string } | { kind: 'link'; href: string };

// http(s) only: a javascript:, data: or file: address in a message stays text. Trailing
// punctuation ends a sentence, not the address.
const ADDRESS = /https?:\/\/[^\s<>"']+[^\s<>"'.,;:!?)\]]/g;

/**
 * A mail's plain text cut into text and http(s) links, in order, so the page can render links
 * as anchors and everything else as text (never as HTML).
 * @example mailSegments('Open http://127.0.0.1:4300/invite/ab. Thanks') // [text 'Open ', link 'http://127.0.0.1:4300/invite/ab', text '. Thanks']
 */
export function mailSegments(text: string): MailSegment[] {
  const segments: MailSegment[] = [];
  let at = 0;
  for (const match of text.matchAll(ADDRESS)) {
    const start = match.index;
    if (start > at) segments.push({ kind: 'text', text: text.slice(at, start) });
    segments.push({ kind: 'link', href: match[0] });
    at = start + match[0].length;
  }
  if (at < text.length) segments.push({ kind: 'text', text: text.slice(at) });
  return segments;
}
