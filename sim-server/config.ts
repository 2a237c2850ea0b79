import { z } from 'zod';
import { describeFieldErrors, parseWith } from '../shared/validation/field-errors';

/** Everything the server reads from its environment; nothing else reads process.env. */
export interface ServerConfig {
  host: string;
  port: number;
  databaseUrl: string;
  /** demo: seeds demo users and scenarios and shows their sign-ins; production: neither. */
  mode: 'demo' | 'production';
  sessionSecret: string;
  logLevel: 'fatal' | 'error' | 'warn' | 'info' | 'debug' | 'trace' | 'silent';
  /** Failed sign-in attempts allowed per address and e-mail within signInWindowMinutes. */
  signInLimit: number;
  signInWindowMinutes: number;
  /** Live runs one server accepts at once; more are refused with a message. */
  maxLiveRuns: number;
  /** Folder of the built Angular app, served at /. */
  staticDir: string;
}

const envSchema = z.object({
  HOST: z.string().min(1).default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(4300),
  DATABASE_URL: z.string({ error: 'DATABASE_URL is required (npm start sets it for the local cluster)' }).regex(/^postgres(ql)?:\/\//, {
    error: 'DATABASE_URL must start with postgres:// or postgresql://',
  }),
  KINETWIN_MODE: z.enum(['demo', 'production']).default('demo'),
  SESSION_SECRET: z.string().min(16, { error: 'SESSION_SECRET must be at least 16 characters' }).optional(),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  SIGN_IN_LIMIT: z.coerce.number().int().positive().default(10),
  SIGN_IN_WINDOW_MINUTES: z.coerce.number().positive().default(10),
  MAX_LIVE_RUNS: z.coerce.number().int().positive().default(200),
  STATIC_DIR: z.string().default('dist/app/browser'),
});

/** Parses the environment; on error returns one line naming each bad variable. */
export function readConfig(env: Record<string, string | undefined>): { ok: true; config: ServerConfig } | { ok: false; message: string } {
  const parsed = parseWith(envSchema, env);
  if (!parsed.ok) return { ok: false, message: `configuration: ${describeFieldErrors(parsed.errors)}` };
  const e = parsed.value;
  if (e.KINETWIN_MODE === 'production' && !e.SESSION_SECRET) {
    return { ok: false, message: 'configuration: SESSION_SECRET is required when KINETWIN_MODE=production' };
  }
  return {
    ok: true,
    config: {
      host: e.HOST,
      port: e.PORT,
      databaseUrl: e.DATABASE_URL,
      mode: e.KINETWIN_MODE,
      // Demo mode without a secret still signs cookies; they just do not outlive a restart.
      sessionSecret: e.SESSION_SECRET ?? crypto.randomUUID() + crypto.randomUUID(),
      logLevel: e.LOG_LEVEL,
      signInLimit: e.SIGN_IN_LIMIT,
      signInWindowMinutes: e.SIGN_IN_WINDOW_MINUTES,
      maxLiveRuns: e.MAX_LIVE_RUNS,
      staticDir: e.STATIC_DIR,
    },
  };
}
