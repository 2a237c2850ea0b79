import { createHash, randomBytes } from 'node:crypto';

/**
 * Single-use link tokens (invitations, password resets): 32 random bytes as base64url, of which
 * only the SHA-256 is stored. A plain hash suffices because the token is random and long; a
 * stolen table reveals no usable link.
 */
export function newLinkToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashLinkToken(token) };
}

export function hashLinkToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}
