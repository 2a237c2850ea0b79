import { channel } from 'node:diagnostics_channel';
import { randomBytes, scrypt, timingSafeEqual, type ScryptOptions } from 'node:crypto';
import { HashGate } from './hash-gate';
import { isBcryptHash, verifyBcryptOffThread } from './legacy-bcrypt';

/**
 * scrypt (RFC 7914) through node:crypto, which runs the derivation in libuv's thread pool, never
 * on the event loop. N = 2^14, r = 8, p = 5 is one of the equivalent minimum settings of the
 * OWASP Password Storage Cheat Sheet (from memory: 2^17/8/1, 2^16/8/2, 2^15/8/3, 2^14/8/5); of
 * those it needs the least memory per hash, 128·r·N bytes = 16 MiB (RFC 7914 §6 ROMix), so
 * several sign-ins at once stay cheap in memory while each still costs ~200 ms of one core
 * (measured on the 2-core development machine). A 16-byte random salt per password, a 32-byte key.
 */
export const SCRYPT_PARAMS = { log2N: 14, r: 8, p: 5, keyLength: 32, saltLength: 16 } as const;

/**
 * Published once per password derivation (hash or check, real or dummy), for tests and metrics:
 * `{ scheme: 'scrypt' | 'bcrypt', purpose: 'hash' | 'verify' }`.
 */
export const PASSWORD_WORK_CHANNEL = 'kinetwin:password-work';
const work = channel(PASSWORD_WORK_CHANNEL);

/** Outcome of a password check; `rehash` when it matched a hash of an older scheme or cost. */
export interface PasswordCheck {
  match: boolean;
  rehash: boolean;
}

const gate = new HashGate(1);

/** How many derivations may run at once (PASSWORD_HASH_CONCURRENCY); create-app sets it. */
export function setPasswordHashConcurrency(limit: number): void {
  gate.setLimit(limit);
}

interface ScryptHash {
  log2N: number;
  r: number;
  p: number;
  salt: Buffer;
  key: Buffer;
}

// PHC string format: $scrypt$ln=14,r=8,p=5$<salt>$<key>, base64 without padding.
const SCRYPT_FORMAT = /^\$scrypt\$ln=(\d{1,2}),r=(\d{1,3}),p=(\d{1,3})\$([A-Za-z0-9+/]+)\$([A-Za-z0-9+/]+)$/;

function parseScryptHash(stored: string): ScryptHash | null {
  const m = SCRYPT_FORMAT.exec(stored);
  if (!m) return null;
  const [log2N, r, p] = [Number(m[1]), Number(m[2]), Number(m[3])];
  // Refuse stored costs past what any setting of ours wrote: a corrupted row must not cost minutes.
  if (log2N < 1 || log2N > 20 || r < 1 || r > 32 || p < 1 || p > 16) return null;
  const salt = Buffer.from(m[4]!, 'base64');
  const key = Buffer.from(m[5]!, 'base64');
  if (salt.length < 8 || salt.length > 64 || key.length < 16 || key.length > 64) return null;
  return { log2N, r, p, salt, key };
}

function formatScryptHash(h: ScryptHash): string {
  const b64 = (b: Buffer) => b.toString('base64').replace(/=+$/, '');
  return `$scrypt$ln=${h.log2N},r=${h.r},p=${h.p}$${b64(h.salt)}$${b64(h.key)}`;
}

function derive(password: string, salt: Buffer, h: Pick<ScryptHash, 'log2N' | 'r' | 'p'>, keyLength: number, purpose: 'hash' | 'verify'): Promise<Buffer> {
  const N = 2 ** h.log2N;
  // Node refuses a derivation needing more than maxmem; allow the 128·r·N of RFC 7914 plus headroom.
  const options: ScryptOptions = { N, r: h.r, p: h.p, maxmem: 2 * 128 * h.r * N + 1024 * 1024 };
  return gate.run(
    () =>
      new Promise<Buffer>((resolve, reject) => {
        work.publish({ scheme: 'scrypt', purpose });
        scrypt(password.normalize('NFC'), salt, keyLength, options, (err, key) => (err ? reject(err) : resolve(key)));
      }),
  );
}

/** A new scrypt hash of the password, in PHC string format. */
export async function hashPassword(password: string): Promise<string> {
  const salt = randomBytes(SCRYPT_PARAMS.saltLength);
  const key = await derive(password, salt, SCRYPT_PARAMS, SCRYPT_PARAMS.keyLength, 'hash');
  return formatScryptHash({ ...SCRYPT_PARAMS, salt, key });
}

/**
 * Checks a password against a stored hash: scrypt in libuv's threads, a legacy bcrypt hash
 * (bcryptjs, before scrypt) in a worker thread; either way off the event loop. An unreadable
 * hash never matches.
 */
export async function checkPassword(password: string, stored: string): Promise<PasswordCheck> {
  const parsed = parseScryptHash(stored);
  if (parsed) {
    const key = await derive(password, parsed.salt, parsed, parsed.key.length, 'verify');
    const match = key.length === parsed.key.length && timingSafeEqual(key, parsed.key);
    const current = parsed.log2N === SCRYPT_PARAMS.log2N && parsed.r === SCRYPT_PARAMS.r && parsed.p === SCRYPT_PARAMS.p && parsed.key.length === SCRYPT_PARAMS.keyLength;
    return { match, rehash: match && !current };
  }
  if (isBcryptHash(stored)) {
    const match = await gate.run(() => {
      work.publish({ scheme: 'bcrypt', purpose: 'verify' });
      return verifyBcryptOffThread(password, stored);
    });
    return { match, rehash: match };
  }
  return { match: false, rehash: false };
}

/** Whether the password matches the stored hash (any scheme). */
export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  return (await checkPassword(password, stored)).match;
}

// A stored hash no password matches (its key is random bytes, not derived), so checking against
// it is exactly one derivation at the current cost, as for a real account.
const unknownUserHash = formatScryptHash({ ...SCRYPT_PARAMS, salt: randomBytes(SCRYPT_PARAMS.saltLength), key: randomBytes(SCRYPT_PARAMS.keyLength) });

/** The check made when the e-mail is unknown: the same work as a wrong password; never matches. */
export async function burnPasswordCheck(password: string): Promise<boolean> {
  return (await checkPassword(password, unknownUserHash)).match;
}
