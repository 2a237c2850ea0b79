/** Most distinct mentions one comment may notify; more are ignored, so a paste cannot mail-bomb a team. */
export const MAX_MENTIONS = 20;

// "@" at the start or after a space/bracket, then an e-mail address; a sentence's final dot is not
// part of the domain because the top-level label must follow a dot and be letters only.
const MENTION = /(?:^|[\s(])@([a-z0-9._%+-]+@[a-z0-9-]+(?:\.[a-z0-9-]+)*\.[a-z]{2,})/gi;

/**
 * The distinct e-mail addresses mentioned in a comment as "@name@example.com", lower-cased, in
 * order of first appearance, at most MAX_MENTIONS.
 * @example mentionedEmails('@ana@lab.test please check, cc @Bo@lab.test.') // ['ana@lab.test', 'bo@lab.test']
 */
export function mentionedEmails(body: string): string[] {
  const found: string[] = [];
  for (const match of body.matchAll(MENTION)) {
    const email = match[1]!.toLowerCase();
    if (!found.includes(email)) found.push(email);
    if (found.length === MAX_MENTIONS) break;
  }
  return found;
}
