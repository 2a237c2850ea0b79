import { availableParallelism, tmpdir } from 'node:os';
import path from 'node:path';
import { z } from 'zod';
import { describeFieldErrors, parseWith } from '../shared/validation/field-errors';
import { parseTrustedProxies } from './auth/trusted-proxies';
import { CHECK_QUEUE_SIZE, CHECK_TIME_LIMIT_MS } from './checks/check-limits';

/** Everything the server reads from its environment; nothing else reads process.env. */
export interface ServerConfig {
  host: string;
  port: number;
  /** The role the server serves with: least privilege (sim-server/db/app-grants.ts). */
  databaseUrl: string;
  /**
   * The role that owns the schema: migrations, the demo seed and the app role's grants run with
   * it. Null when DATABASE_OWNER_URL is unset: then DATABASE_URL migrates too (a hosted setup
   * whose migrations run separately, e.g. `npm run db:migrate` in its release step, leaves the
   * server nothing to migrate and no grants to apply).
   */
  databaseOwnerUrl: string | null;
  /**
   * Serve even when the DATABASE_URL role is a superuser, may create roles or databases, or owns
   * part of the schema. Off by default: the start-up check (sim-server/db/app-role-check.ts)
   * refuses such a role, since with it no grant and no trigger protects the data.
   */
  allowPrivilegedDatabaseRole: boolean;
  /** demo: seeds demo users and scenarios and shows their sign-ins; production: neither. */
  mode: 'demo' | 'production';
  sessionSecret: string;
  logLevel: 'fatal' | 'error' | 'warn' | 'info' | 'debug' | 'trace' | 'silent';
  /** Failed sign-ins allowed per account (e-mail), from any address, within signInWindowMinutes; one more locks it. */
  signInLimit: number;
  signInWindowMinutes: number;
  /** How long a locked account stays locked, minutes, unless its owner completes a password reset first. */
  signInLockoutMinutes: number;
  /** Failed sign-ins allowed per client address, across all e-mails, within signInWindowMinutes. */
  signInAddressLimit: number;
  /** Proxies whose X-Forwarded-For is believed (Express `trust proxy` list), or false: none, req.ip is the socket's address. */
  trustProxy: string[] | false;
  /** Password hashes (scrypt, legacy bcrypt) computed at once; the rest wait their turn. */
  passwordHashConcurrency: number;
  /** How often expired sessions are deleted from the session table, seconds. */
  sessionPruneIntervalSeconds: number;
  /** Sign-ups, invitation look-ups and password-reset requests allowed per address within signInWindowMinutes. */
  accountRequestLimit: number;
  /** Live runs one server accepts at once; more are refused with a message. */
  maxLiveRuns: number;
  /** Folder of the built Angular app, served at /. */
  staticDir: string;
  /** outbox: messages are written to the outbox table (default); smtp: sent through smtpUrl. */
  mailTransport: 'outbox' | 'smtp';
  smtpUrl: string | null;
  /** From address of every message the server sends. */
  mailFrom: string;
  /** Origin the app is reached at; e-mailed links start with it, and unsafe requests may come from it. */
  appBaseUrl: string;
  /** False when APP_BASE_URL is unset and appBaseUrl was made from HOST and PORT. */
  appBaseUrlConfigured: boolean;
  invitationTtlHours: number;
  passwordResetTtlMinutes: number;
  /** Worker threads that run the bench's checks (POST /api/checks) off the event loop. */
  checkWorkers: number;
  /** Checks jobs that may wait for a free worker; one more is refused with 503. */
  checkQueueSize: number;
  /** Longest one checks job may take, waiting included, ms; past it the worker is stopped and the answer is 504. */
  checkTimeLimitMs: number;
  /** Largest CSV log one upload may carry, bytes (KINETWIN_LOG_UPLOAD_MAX_MB, in MiB); a larger one is refused with 413 and nothing kept. */
  logUploadMaxBytes: number;
  /** Folder uploads are written to while they are read; each file is removed when its request ends. */
  logUploadDir: string;
}

/** Default upload limit, MiB: a 50 MB log (~30 min at 1 kHz, five signals) fits with room. */
export const DEFAULT_LOG_UPLOAD_MAX_MB = 64;
/** Largest upload limit accepted, MiB: beyond it a log exceeds the sample limit anyway (shared/calibration/log-options.ts). */
export const MAX_LOG_UPLOAD_MAX_MB = 512;

/** Most check workers accepted: beyond the cores of any machine this runs on, more threads only add memory. */
export const MAX_CHECK_WORKERS = 64;

/** One core stays with the event loop (HTTP, sockets, live runs); the rest run checks. */
export function defaultCheckWorkers(cores = availableParallelism()): number {
  return Math.max(1, cores - 1);
}

/**
 * Password hashes at once: one core stays with the event loop, and at most two of libuv's four
 * default threads hash, so file and DNS work (the same thread pool) is never queued behind them.
 */
export function defaultPasswordHashConcurrency(cores = availableParallelism()): number {
  return Math.min(2, Math.max(1, cores - 1));
}

/** A whole-number setting within [min, max], each refusal naming the variable and the bound. */
function wholeNumber(name: string, min: number, max: number, unit = '') {
  return z.coerce
    .number({ error: `${name} must be a whole number${unit}` })
    .int({ error: `${name} must be a whole number${unit}` })
    .min(min, { error: min === 0 ? `${name} must be zero or more` : `${name} must be at least ${min}` })
    .max(max, { error: `${name} must be at most ${max}` });
}

const envSchema = z.object({
  HOST: z.string().min(1).default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(4300),
  DATABASE_URL: z.string({ error: 'DATABASE_URL is required (npm start sets it for the local cluster)' }).regex(/^postgres(ql)?:\/\//, {
    error: 'DATABASE_URL must start with postgres:// or postgresql://',
  }),
  DATABASE_OWNER_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//, { error: 'DATABASE_OWNER_URL must start with postgres:// or postgresql://' })
    .optional(),
  ALLOW_PRIVILEGED_DATABASE_ROLE: z.enum(['true', 'false'], { error: 'ALLOW_PRIVILEGED_DATABASE_ROLE must be true or false' }).default('false'),
  KINETWIN_MODE: z.enum(['demo', 'production']).default('demo'),
  SESSION_SECRET: z.string().min(16, { error: 'SESSION_SECRET must be at least 16 characters' }).optional(),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  SIGN_IN_LIMIT: wholeNumber('SIGN_IN_LIMIT', 1, 1000).default(10),
  SIGN_IN_WINDOW_MINUTES: z.coerce.number().positive().default(10),
  SIGN_IN_LOCKOUT_MINUTES: wholeNumber('SIGN_IN_LOCKOUT_MINUTES', 1, 24 * 60, ' of minutes').default(30),
  SIGN_IN_ADDRESS_LIMIT: wholeNumber('SIGN_IN_ADDRESS_LIMIT', 1, 100_000).default(50),
  TRUST_PROXY: z.string().optional(),
  PASSWORD_HASH_CONCURRENCY: wholeNumber('PASSWORD_HASH_CONCURRENCY', 1, 16).optional(),
  SESSION_PRUNE_INTERVAL_SECONDS: wholeNumber('SESSION_PRUNE_INTERVAL_SECONDS', 1, 24 * 3600, ' of seconds').default(15 * 60),
  ACCOUNT_REQUEST_LIMIT: z.coerce.number().int().positive().default(20),
  MAX_LIVE_RUNS: z.coerce.number().int().positive().default(200),
  STATIC_DIR: z.string().default('dist/app/browser'),
  MAIL_TRANSPORT: z.enum(['outbox', 'smtp'], { error: 'MAIL_TRANSPORT must be outbox or smtp' }).default('outbox'),
  SMTP_URL: z.string().regex(/^smtps?:\/\//, { error: 'SMTP_URL must start with smtp:// or smtps://' }).optional(),
  MAIL_FROM: z.string().min(3).max(254).default('Kinetwin <no-reply@kinetwin.invalid>'),
  APP_BASE_URL: z.url({ protocol: /^https?$/, error: 'APP_BASE_URL must be an http:// or https:// address' }).optional(),
  INVITATION_TTL_HOURS: z.coerce.number().positive().max(24 * 30).default(72),
  PASSWORD_RESET_TTL_MINUTES: z.coerce.number().positive().max(24 * 60).default(60),
  KINETWIN_CHECK_WORKERS: wholeNumber('KINETWIN_CHECK_WORKERS', 1, MAX_CHECK_WORKERS).optional(),
  KINETWIN_CHECK_QUEUE: wholeNumber('KINETWIN_CHECK_QUEUE', 0, 1000).default(CHECK_QUEUE_SIZE),
  KINETWIN_LOG_UPLOAD_MAX_MB: wholeNumber('KINETWIN_LOG_UPLOAD_MAX_MB', 1, MAX_LOG_UPLOAD_MAX_MB, ' of MiB').default(DEFAULT_LOG_UPLOAD_MAX_MB),
  KINETWIN_LOG_UPLOAD_DIR: z.string().min(1, { error: 'KINETWIN_LOG_UPLOAD_DIR must not be empty' }).optional(),
  KINETWIN_CHECK_TIME_LIMIT_MS: wholeNumber('KINETWIN_CHECK_TIME_LIMIT_MS', 100, 3_600_000, ' of milliseconds').default(CHECK_TIME_LIMIT_MS),
});

/** Parses the environment; on error returns one line naming each bad variable. */
export function readConfig(env: Record<string, string | undefined>): { ok: true; config: ServerConfig } | { ok: false; message: string } {
  const parsed = parseWith(envSchema, env);
  if (!parsed.ok) return { ok: false, message: `configuration: ${describeFieldErrors(parsed.errors)}` };
  const e = parsed.value;
  if (e.KINETWIN_MODE === 'production' && !e.SESSION_SECRET) {
    return { ok: false, message: 'configuration: SESSION_SECRET is required when KINETWIN_MODE=production' };
  }
  if (e.KINETWIN_MODE === 'production' && !e.APP_BASE_URL) {
    return { ok: false, message: 'configuration: APP_BASE_URL is required when KINETWIN_MODE=production (e-mailed links start with it)' };
  }
  const trustProxy = parseTrustedProxies(e.TRUST_PROXY);
  if (!trustProxy.ok) return { ok: false, message: `configuration: ${trustProxy.message}` };
  if (e.MAIL_TRANSPORT === 'smtp') {
    if (!e.SMTP_URL) return { ok: false, message: 'configuration: SMTP_URL is required when MAIL_TRANSPORT=smtp' };
  }
  return {
    ok: true,
    config: {
      host: e.HOST,
      port: e.PORT,
      databaseUrl: e.DATABASE_URL,
      databaseOwnerUrl: e.DATABASE_OWNER_URL ?? null,
      allowPrivilegedDatabaseRole: e.ALLOW_PRIVILEGED_DATABASE_ROLE === 'true',
      mode: e.KINETWIN_MODE,
      // Demo mode without a secret still signs cookies; they just do not outlive a restart.
      sessionSecret: e.SESSION_SECRET ?? crypto.randomUUID() + crypto.randomUUID(),
      logLevel: e.LOG_LEVEL,
      signInLimit: e.SIGN_IN_LIMIT,
      signInWindowMinutes: e.SIGN_IN_WINDOW_MINUTES,
      signInLockoutMinutes: e.SIGN_IN_LOCKOUT_MINUTES,
      signInAddressLimit: e.SIGN_IN_ADDRESS_LIMIT,
      trustProxy: trustProxy.value,
      passwordHashConcurrency: e.PASSWORD_HASH_CONCURRENCY ?? defaultPasswordHashConcurrency(),
      sessionPruneIntervalSeconds: e.SESSION_PRUNE_INTERVAL_SECONDS,
      accountRequestLimit: e.ACCOUNT_REQUEST_LIMIT,
      maxLiveRuns: e.MAX_LIVE_RUNS,
      staticDir: e.STATIC_DIR,
      mailTransport: e.MAIL_TRANSPORT,
      smtpUrl: e.SMTP_URL ?? null,
      mailFrom: e.MAIL_FROM,
      appBaseUrl: new URL(e.APP_BASE_URL ?? `http://${e.HOST}:${e.PORT}`).origin,
      appBaseUrlConfigured: e.APP_BASE_URL !== undefined,
      invitationTtlHours: e.INVITATION_TTL_HOURS,
      passwordResetTtlMinutes: e.PASSWORD_RESET_TTL_MINUTES,
      checkWorkers: e.KINETWIN_CHECK_WORKERS ?? defaultCheckWorkers(),
      checkQueueSize: e.KINETWIN_CHECK_QUEUE,
      checkTimeLimitMs: e.KINETWIN_CHECK_TIME_LIMIT_MS,
      logUploadMaxBytes: e.KINETWIN_LOG_UPLOAD_MAX_MB * 1024 * 1024,
      logUploadDir: path.resolve(e.KINETWIN_LOG_UPLOAD_DIR ?? path.join(tmpdir(), 'kinetwin-log-uploads')),
    },
  };
}
