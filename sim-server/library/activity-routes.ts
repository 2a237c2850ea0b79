import { activityQuerySchema } from '../../shared/protocol/library-api';
import { userOf } from '../auth/require-user';
import type { GuardedRouter } from '../auth/route-table';
import { requireScenario } from '../scenarios/scenario-detail';
import { listActivity } from './activity-log';
import type { LibraryDeps } from './library-deps';
import { idParam, queryOf } from './request-input';

/** GET /api/scenarios/:id/activity: who did what to one scenario, newest first. */
export function scenarioActivityRoutes({ route }: GuardedRouter, { db }: LibraryDeps): void {
  route('get', '/:id/activity', 'activity.read', async (req, res) => {
    const user = userOf(req);
    const id = idParam(req, 'id', 'scenario id');
    const query = queryOf(req, activityQuerySchema);
    await requireScenario(db, user, id);
    res.json(await listActivity(db, user.teamId, id, query.page, query.pageSize));
  });
}

/** GET /api/team/activity: the whole team's log, newest first. */
export function teamActivityRoutes({ route }: GuardedRouter, { db }: LibraryDeps): void {
  route('get', '/activity', 'activity.read', async (req, res) => {
    const user = userOf(req);
    const query = queryOf(req, activityQuerySchema);
    res.json(await listActivity(db, user.teamId, null, query.page, query.pageSize));
  });
}
