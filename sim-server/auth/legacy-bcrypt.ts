import { Piscina } from 'piscina';
import { workerExecArgv } from '../checks/check-pool';

/** An idle bcrypt thread ends after this, ms; legacy hashes become rarer as sign-ins rehash them. */
export const BCRYPT_WORKER_IDLE_MS = 60_000;

const BCRYPT_WORKER_FILE = new URL('./bcrypt-worker.ts', import.meta.url).href;

/** bcrypt's modular-crypt prefixes ($2a$, $2b$, $2y$), as bcryptjs writes and reads them. */
export function isBcryptHash(stored: string): boolean {
  return /^\$2[aby]\$\d{2}\$/.test(stored);
}

let pool: Piscina<{ password: string; hash: string }, boolean> | null = null;

/** Checks a password against a legacy bcrypt hash in a worker thread (started on first use). */
export function verifyBcryptOffThread(password: string, hash: string): Promise<boolean> {
  pool ??= new Piscina({
    filename: BCRYPT_WORKER_FILE,
    minThreads: 0,
    // One thread: the hash gate already bounds how many checks run at once.
    maxThreads: 1,
    idleTimeout: BCRYPT_WORKER_IDLE_MS,
    execArgv: workerExecArgv(process.execArgv),
  });
  return pool.run({ password, hash });
}

/** Ends the bcrypt thread, if one runs; the next legacy check starts a new one. */
export async function closeBcryptWorker(): Promise<void> {
  const current = pool;
  pool = null;
  if (current) await current.destroy();
}
