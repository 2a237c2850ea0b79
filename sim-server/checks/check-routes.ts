import type { Request, Response } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { ApiErrorBody } from '../../shared/protocol/api-types';
import { checkRequestSchema, operatingRangeRequestSchema, sineSweepRequestSchema, type CheckResponse } from '../../shared/protocol/check-api';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import type { FieldError } from '../../shared/validation/field-errors';
import { twinScenarioErrors } from '../../shared/twin/twin-scenario-errors';
import { AppError } from '../http/app-error';
import type { GuardedRouter } from '../auth/route-table';
import { bodyOf } from '../library/request-input';
import { CHECK_RATE_LIMIT, CHECK_RATE_WINDOW_MS } from './check-limits';
import type { CheckPool } from './check-pool';
import { sweepOnPool } from './parallel-sweep';

/** Said when a draft fails validation; the field errors follow it. */
export const INVALID_CHECK_REQUEST = 'The scenario cannot be checked; no checks were run.';

/**
 * POST /api/checks: the superposition check, the shift check, the linear range and the twin
 * against the closed form of the posted draft scenario; /sine-sweep: the twin's measured
 * frequency response; /operating-range: the linear model about an angle and how far it holds.
 * Each runs in a worker thread of `pool`, under one per-user rate limit.
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
    refuseWhatTheTwinRefuses(scenario, INVALID_CHECK_REQUEST);
    const answer: CheckResponse = await pool.run({ kind: 'checks', scenario }, stopWhenGone(res));
    res.json(answer);
  });

  // The twin's measured frequency response: one twin run per frequency, spread over the pool's threads.
  route('post', '/sine-sweep', 'bench.check', limiter, async (req, res) => {
    const body = bodyOf(req, sineSweepRequestSchema, INVALID_SWEEP_REQUEST);
    refuseWhatTheTwinRefuses(body.scenario, INVALID_SWEEP_REQUEST);
    res.json(answerOrRefuse(await sweepOnPool(pool, body, stopWhenGone(res)), INVALID_SWEEP_REQUEST));
  });

  // The linear model about an operating angle and the largest move it describes.
  route('post', '/operating-range', 'bench.check', limiter, async (req, res) => {
    const body = bodyOf(req, operatingRangeRequestSchema, INVALID_OPERATING_RANGE_REQUEST);
    refuseWhatTheTwinRefuses(body.scenario, INVALID_OPERATING_RANGE_REQUEST);
    res.json(answerOrRefuse(await pool.run({ kind: 'operating-range', ...body }, stopWhenGone(res)), INVALID_OPERATING_RANGE_REQUEST));
  });
}

export const INVALID_SWEEP_REQUEST = 'The twin\'s response cannot be measured; nothing was run.';
export const INVALID_OPERATING_RANGE_REQUEST = 'The joint cannot be linearized there; nothing was run.';

/** The schema passes some combinations only the twin refuses (an encoder on a continuous loop). */
function refuseWhatTheTwinRefuses(scenario: Scenario, message: string): void {
  const twinErrors = twinScenarioErrors(scenario);
  if (twinErrors.length > 0) throw AppError.badRequest(message, twinErrors.map((e) => ({ field: `scenario.${e.field}`, message: e.message })));
}

/** A client that goes away stops its job, so the worker is free for the next one. */
function stopWhenGone(res: Response): AbortSignal {
  const gone = new AbortController();
  res.on('close', () => {
    if (!res.writableFinished) gone.abort();
  });
  return gone.signal;
}

/** A worker's field errors (a request it could not serve) as a 400; anything else as the answer. */
function answerOrRefuse<T extends object>(answer: T | { errors: FieldError[] }, message: string): T {
  if ('errors' in answer) throw AppError.badRequest(message, answer.errors);
  return answer;
}
