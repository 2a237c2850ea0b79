/** Where a signed-in user lands when no (usable) return address was given. */
export const DEFAULT_LANDING_URL = '/library';

/**
 * The in-app address to return to after sign-in. Only a path inside this app is followed, so a
 * crafted `?next=` cannot send a freshly signed-in user to another site.
 * @example safeReturnUrl('/bench/3') // "/bench/3"
 * @example safeReturnUrl('//elsewhere.example') // "/library"
 */
export function safeReturnUrl(next: string | null): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return DEFAULT_LANDING_URL;
  if (next === '/' || next.startsWith('/sign-in')) return DEFAULT_LANDING_URL;
  return next;
}
