import { Piscina } from 'piscina';
import type { BatchKind, BatchResults, BatchTask } from './batch-task';
import { AppError } from '../http/app-error';
import type { Logger } from '../logging/logger';

/**
 * An idle worker thread ends after this, ms; the next job starts one again (a few hundred ms:
 * the thread loads the TypeScript sources through tsx).
 */
export const CHECK_WORKER_IDLE_MS = 5 * 60_000;

/** The worker thread's module; it exports the task as its default. */
export const CHECK_WORKER_FILE = new URL('./check-worker.ts', import.meta.url).href;

/** How the pool is sized and bounded; config.ts reads these from the environment. */
export interface CheckPoolOptions {
  /** Worker threads at most (KINETWIN_CHECK_WORKERS). */
  workers: number;
  /** Jobs waiting beyond the running ones (KINETWIN_CHECK_QUEUE). */
  queueSize: number;
  /** Per-job limit, ms (KINETWIN_CHECK_TIME_LIMIT_MS). */
  timeLimitMs: number;
  logger: Logger;
  /** Module the workers load (file URL); default CHECK_WORKER_FILE. Tests give one that fails. */
  workerFile?: string;
}

/** The worker threads that run the checks, off the event loop. */
export interface CheckPool {
  /**
   * Runs one batch task (the checks of a scenario, a measured sweep, an operating range) in a
   * worker thread. Rejects with an AppError: 503 when the queue is full or the server is
   * closing, 504 past the time limit (the worker is stopped), 500 when the worker failed
   * (logged), 499 when `cancel` aborted (the client went away).
   */
  run<K extends BatchKind>(task: Extract<BatchTask, { kind: K }>, cancel?: AbortSignal): Promise<BatchResults[K]>;
  /** Worker threads the pool may run at once. */
  readonly workers: number;
  /** Jobs accepted and not yet answered: running plus waiting. */
  pending(): number;
  /** Worker threads alive now. */
  threads(): number;
  /** Refuses new jobs, stops the running ones and ends every worker thread. */
  close(): Promise<void>;
}

/**
 * Node's execArgv for the workers: the server runs as `node --import tsx …`, and workers inherit
 * that; a process started another way (vitest runs the integration tests in-process with its own
 * transform, which worker threads do not get) needs tsx added to load the .ts worker file.
 */
export function workerExecArgv(parentExecArgv: readonly string[]): string[] {
  const hasTsx = parentExecArgv.some((arg, i) => (arg === 'tsx' && parentExecArgv[i - 1] === '--import') || arg === '--import=tsx');
  return hasTsx ? [...parentExecArgv] : [...parentExecArgv, '--import', 'tsx'];
}

/** The pool; its threads start with the first job, so a server that runs no checks holds none. */
export function createCheckPool(options: CheckPoolOptions): CheckPool {
  const { workers, queueSize, timeLimitMs, logger, workerFile = CHECK_WORKER_FILE } = options;
  let piscina: Piscina<BatchTask, BatchResults[BatchKind]> | null = null;
  let pending = 0;
  let closing = false;

  const open = () =>
    (piscina ??= new Piscina<BatchTask, BatchResults[BatchKind]>({
      filename: workerFile,
      minThreads: 0,
      maxThreads: workers,
      // The gate in run() keeps the queue within queueSize; this is piscina's own backstop.
      maxQueue: queueSize + workers,
      concurrentTasksPerWorker: 1,
      idleTimeout: CHECK_WORKER_IDLE_MS,
      execArgv: workerExecArgv(process.execArgv),
    }));

  return {
    async run<K extends BatchKind>(task: Extract<BatchTask, { kind: K }>, cancel?: AbortSignal): Promise<BatchResults[K]> {
      if (closing) throw new AppError(503, 'shutting_down', 'The server is shutting down; run the checks again once it is back.');
      if (pending >= workers + queueSize) {
        throw busy(workers, queueSize);
      }
      pending++;
      const timeout = AbortSignal.timeout(timeLimitMs);
      const signal = cancel ? AbortSignal.any([timeout, cancel]) : timeout;
      try {
        return (await open().run(task, { signal })) as BatchResults[K];
      } catch (err) {
        if (timeout.aborted) {
          throw new AppError(
            504,
            'checks_timeout',
            `The checks did not finish within ${formatSeconds(timeLimitMs)} (waiting for a free worker included) and were stopped. ` +
              'A sampled loop with a short sample period over a long horizon is the usual cause: shorten the horizon or lengthen controller.samplePeriod.',
          );
        }
        if (cancel?.aborted) throw new AppError(499, 'client_closed', 'The request was closed before the checks finished; they were stopped.');
        if (closing) throw new AppError(503, 'shutting_down', 'The server shut down while the checks ran; run them again once it is back.');
        if (err instanceof Error && err.message === 'Task queue is at limit') throw busy(workers, queueSize);
        logger.error({ err }, 'checks worker failed');
        throw new AppError(500, 'checks_failed', 'The checks failed in their worker thread; the error has been logged and the server is unaffected.');
      } finally {
        pending--;
      }
    },
    workers,
    pending: () => pending,
    threads: () => piscina?.threads.length ?? 0,
    async close() {
      closing = true;
      const pool = piscina;
      piscina = null;
      if (pool) await pool.destroy();
    },
  };
}

function busy(workers: number, queueSize: number): AppError {
  return new AppError(503, 'checks_busy', `The server is already running checks for others (${workers} running, ${queueSize} waiting, the most it takes). Try again in a minute.`);
}

/** "60 s", "0.5 s". */
function formatSeconds(ms: number): string {
  return `${+(ms / 1000).toFixed(3)} s`;
}
