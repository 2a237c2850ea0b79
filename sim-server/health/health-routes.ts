import { Router } from 'express';
import type pg from 'pg';
import type { AppInfo, HealthReport } from '../../shared/protocol/api-types';
import { pingDatabase } from '../db/database';

export function healthRoutes(pool: pg.Pool, version: string): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    let report: HealthReport;
    try {
      const latencyMs = await pingDatabase(pool);
      report = { status: 'ok', version, database: { ok: true, latencyMs: Math.round(latencyMs * 100) / 100 } };
    } catch (err) {
      report = { status: 'degraded', version, database: { ok: false, latencyMs: null, error: (err as Error).message } };
    }
    res.status(report.status === 'ok' ? 200 : 503).json(report);
  });
  return router;
}

export function appInfoRoute(info: AppInfo): Router {
  const router = Router();
  router.get('/', (_req, res) => {
    res.json(info);
  });
  return router;
}
