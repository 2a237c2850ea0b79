import { createHash } from 'node:crypto';
import { getTableName } from 'drizzle-orm';
import { ipKeyGenerator } from 'express-rate-limit';
import type pg from 'pg';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { signInLimits } from '../../drizzle/schema';
import { AppError } from '../http/app-error';

export interface SignInLimitOptions {
  /** Failed sign-ins per account within the window; the next attempt locks the account. */
  accountLimit: number;
  /** Failed sign-ins per client address, across e-mails, within the window. */
  addressLimit: number;
  windowMinutes: number;
  lockoutMinutes: number;
}

/**
 * Sign-in limits kept in PostgreSQL, so they hold across server nodes (rate-limiter-flexible's
 * RateLimiterPostgres). Two counters, both taken before the password is hashed so that a burst
 * of concurrent attempts cannot slip past them, and given back on success:
 * - per account (the e-mail, known or not, from any address): past the limit the account is
 *   locked for lockoutMinutes, the right password included, until its owner completes a
 *   password reset (OWASP ASVS 4.0.3 V2.2.1: anti-automation against credential stuffing and
 *   brute force; a reset unlocks it so an attacker cannot lock the owner out for good);
 * - per client address across all e-mails (req.ip: the socket's address unless TRUST_PROXY names
 *   the proxy in front), so one address cannot try a list of accounts.
 */
export interface SignInLimits {
  /** Takes one attempt from both counters; throws a 429 AppError (with retryAfterSeconds) when refused. */
  begin(address: string, email: string): Promise<void>;
  /** The password was right: the account's count ends, the address gets its attempt back. */
  succeeded(address: string, email: string): Promise<void>;
  /** Ends the account's count and lockout (a completed password reset). */
  clearAccount(email: string): Promise<void>;
  /** Ends an address's count (an operator lifting a block; tests starting from a clean count). */
  clearAddress(address: string): Promise<void>;
}

/** A refusal of the limits; `retryAfterSeconds` goes into the Retry-After header (RFC 6585 §4). */
export class SignInRefused extends AppError {
  constructor(
    code: 'account_locked' | 'rate_limited',
    message: string,
    readonly retryAfterSeconds: number,
  ) {
    super(429, code, message);
  }
}

// Row keys: an e-mail only as its SHA-256 (the table keeps no address anyone typed), a client
// address as express-rate-limit keys it (IPv6 by /56).
function accountKey(email: string): string {
  return createHash('sha256').update(email.trim().toLowerCase(), 'utf8').digest('hex');
}
function addressKey(address: string): string {
  return ipKeyGenerator(address);
}

export function createSignInLimits(pool: pg.Pool, options: SignInLimitOptions): SignInLimits {
  // The table comes from migration 0002 (tableCreated): the app's role may not create tables.
  const common = { storeClient: pool, storeType: 'pool', tableName: getTableName(signInLimits), tableCreated: true, duration: options.windowMinutes * 60 };
  const account = new RateLimiterPostgres({ ...common, keyPrefix: 'account', points: options.accountLimit, blockDuration: options.lockoutMinutes * 60 });
  const address = new RateLimiterPostgres({ ...common, keyPrefix: 'address', points: options.addressLimit });

  return {
    async begin(ip, email) {
      try {
        await address.consume(addressKey(ip));
      } catch (err) {
        if (!(err instanceof RateLimiterRes)) throw err;
        const minutes = Math.max(1, Math.ceil(err.msBeforeNext / 60_000));
        throw new SignInRefused('rate_limited', `Too many failed sign-ins from your address. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`, Math.ceil(err.msBeforeNext / 1000));
      }
      try {
        await account.consume(accountKey(email));
      } catch (err) {
        if (!(err instanceof RateLimiterRes)) throw err;
        throw new SignInRefused('account_locked', lockedMessage(err.msBeforeNext), Math.ceil(err.msBeforeNext / 1000));
      }
    },
    async succeeded(ip, email) {
      await Promise.all([account.delete(accountKey(email)), address.reward(addressKey(ip), 1)]);
    },
    async clearAccount(email) {
      await account.delete(accountKey(email));
    },
    async clearAddress(ip) {
      await address.delete(addressKey(ip));
    },
  };
}

/** The same words for every e-mail, known or not, so the lockout says nothing about which accounts exist. */
function lockedMessage(msBeforeNext: number): string {
  const until = new Date(Date.now() + msBeforeNext);
  const minutes = Math.max(1, Math.ceil(msBeforeNext / 60_000));
  return (
    `This account is locked after too many failed sign-ins. It unlocks at ${until.toISOString().slice(11, 16)} UTC (in about ${minutes} minute${minutes === 1 ? '' : 's'}), ` +
    'or at once when you reset its password: choose "Forgot your password?" and follow the link we e-mail you.'
  );
}
