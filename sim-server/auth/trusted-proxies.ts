import { isIP } from 'node:net';

/** The names Express's `trust proxy` (proxy-addr) accepts for ranges of addresses. */
export const PROXY_RANGE_NAMES = ['loopback', 'linklocal', 'uniquelocal'] as const;

/**
 * Reads TRUST_PROXY: the proxies whose X-Forwarded-For the server believes, as a comma-separated
 * list of addresses (10.0.0.5, ::1), subnets (10.0.0.0/8, 10.0.0.0/255.0.0.0, fd00::/8) or the
 * proxy-addr names loopback, linklocal, uniquelocal — the forms Express's `trust proxy` takes as
 * a list (Express 5 API, "trust proxy" setting). Unset, empty or "false": no proxy is trusted and
 * req.ip is the socket's own address. `true` and hop counts are refused: they believe a header
 * any client can write, which is how sign-in limits were dodged (issue 9 §3).
 * @returns the list for `app.set('trust proxy', …)`, or false; or a message naming the bad entry
 */
export function parseTrustedProxies(text: string | undefined): { ok: true; value: string[] | false } | { ok: false; message: string } {
  const trimmed = (text ?? '').trim();
  if (trimmed === '' || trimmed.toLowerCase() === 'false') return { ok: true, value: false };
  if (trimmed.toLowerCase() === 'true' || /^\d+$/.test(trimmed)) {
    return { ok: false, message: `TRUST_PROXY must name the proxies (addresses or subnets such as 10.0.0.5 or 10.0.0.0/8, or loopback); "${trimmed}" would believe X-Forwarded-For from any client` };
  }
  const entries = trimmed.split(',').map((entry) => entry.trim());
  for (const entry of entries) {
    if (!proxyEntryValid(entry)) {
      return { ok: false, message: `TRUST_PROXY: "${entry}" is not an address, a subnet (address/prefix or address/netmask) or one of ${PROXY_RANGE_NAMES.join(', ')}` };
    }
  }
  return { ok: true, value: entries };
}

function proxyEntryValid(entry: string): boolean {
  if ((PROXY_RANGE_NAMES as readonly string[]).includes(entry)) return true;
  const [address = '', range, ...rest] = entry.split('/');
  const family = isIP(address);
  if (family === 0 || rest.length > 0) return false;
  if (range === undefined) return true;
  if (/^\d{1,3}$/.test(range)) return Number(range) <= (family === 4 ? 32 : 128);
  // A dotted netmask is accepted for IPv4 only, as proxy-addr does.
  return family === 4 && isIP(range) === 4;
}
