import type { Request, Response } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { ApiErrorBody } from '../../shared/protocol/api-types';
import { checkRequestSchema, type CheckResponse } from '../../shared/protocol/check-api';
import { twinScenarioErrors } from '../../shared/twin/twin-scenario-errors';
import { AppError } from '../http/app-error';
import type { GuardedRouter } from '../auth/route-table';
import { bodyOf } from '../library/request-input';
import { CHECK_RATE_LIMIT, CHECK_RATE_WINDOW_MS } from './check-limits';
import type { CheckPool } from './check-pool';

/** Said when a draft fails validation; the field errors follow it. */
export const INVALID_CHECK_REQUEST = 'The scenario cannot be checked; no checks were run.';

/**
 * POST /api/checks: the superposition check, the shift check, the linear range and the twin
 * against the closed form of the posted draft scenario, run in a worker thread of `pool`.
 */
export function checkRoutes({ route }: GuardedRouter, { pool }: { pool: CheckPool }): void {
  // Per user, not per address: colleagues behind one proxy each get their own allowance.
  const limiter = rateLimit({
    windowMs: CHECK_RATE_WINDOW_MS,
    limit: CHECK_RATE_LIMIT,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => (req.user ? `user:${req.user.id}` : ipKeyGenerator(req.ip ?? '')),
    handler: (_req: Request, res: Response) => {
      const body: ApiErrorBody = {
        error: { code: 'rate_limited', message: `Too many checks: at most ${CHECK_RATE_LIMIT} a minute each. Try again in a minute.` },
      };
      res.status(429).json(body);
    },
  });

  route('post', '/', 'bench.check', limiter, async (req, res) => {
    const { scenario } = bodyOf(req, checkRequestSchema, INVALID_CHECK_REQUEST);
    // The schema passes some combinations only the twin refuses (an encoder on a continuous loop).
    const twinErrors = twinScenarioErrors(scenario);
    if (twinErrors.length > 0) {
      throw AppError.badRequest(INVALID_CHECK_REQUEST, twinErrors.map((e) => ({ field: `scenario.${e.field}`, message: e.message })));
    }
    // A client that goes away stops its job, so the worker is free for the next one.
    const gone = new AbortController();
    res.on('close', () => {
      if (!res.writableFinished) gone.abort();
    });
    const answer: CheckResponse = await pool.run(scenario, gone.signal);
    res.json(answer);
  });
}
