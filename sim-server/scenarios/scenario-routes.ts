import { Router } from 'express';
import { z } from 'zod';
import { userOf } from '../auth/require-user';
import type { Database } from '../db/database';
import { AppError } from '../http/app-error';
import { findTeamScenario, listTeamScenarios } from './scenario-store';

// Postgres serial ids stop at 2^31 − 1; anything else is a malformed id, not a missing one.
const scenarioId = z.coerce.number().int().positive().max(2_147_483_647);

export function scenarioRoutes(db: Database): Router {
  const router = Router();

  router.get('/', async (req, res) => {
    res.json({ items: await listTeamScenarios(db, userOf(req).teamId) });
  });

  router.get('/:id', async (req, res) => {
    const id = scenarioId.safeParse(/^\d+$/.test(req.params.id) ? req.params.id : Number.NaN);
    if (!id.success) throw AppError.badRequest(`"${req.params.id.slice(0, 40)}" is not a scenario id (a positive whole number).`);
    const detail = await findTeamScenario(db, userOf(req).teamId, id.data);
    if (!detail) throw AppError.notFound(`There is no scenario ${id.data} in your team's library.`);
    res.json(detail);
  });

  return router;
}
