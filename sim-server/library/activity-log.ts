import { and, count, desc, eq } from 'drizzle-orm';
import { activity, scenarios, users } from '../../drizzle/schema';
import type { ActivityAction, ActivityEntry, ActivityPage } from '../../shared/protocol/library-api';
import type { Database } from '../db/database';

/** A database handle or an open transaction: activity is written in the same transaction as the change. */
export type Executor = Pick<Database, 'insert' | 'select' | 'update' | 'execute'>;

export interface ActivityEvent {
  teamId: number;
  actorId: number;
  action: ActivityAction;
  scenarioId?: number | null;
  detail?: ActivityEntry['detail'];
}

/** Appends one entry to the team's activity log. */
export async function recordActivity(db: Executor, event: ActivityEvent): Promise<void> {
  await db.insert(activity).values({
    teamId: event.teamId,
    actorId: event.actorId,
    action: event.action,
    scenarioId: event.scenarioId ?? null,
    detail: event.detail ?? {},
  });
}

/** One page of a team's activity, newest first; restricted to one scenario when given. */
export async function listActivity(db: Database, teamId: number, scenarioId: number | null, page: number, pageSize: number): Promise<ActivityPage> {
  const where = scenarioId === null ? eq(activity.teamId, teamId) : and(eq(activity.teamId, teamId), eq(activity.scenarioId, scenarioId));
  const [rows, [total]] = await Promise.all([
    db
      .select({
        id: activity.id,
        action: activity.action,
        actorId: users.id,
        actorName: users.displayName,
        scenarioId: scenarios.id,
        scenarioName: scenarios.name,
        detail: activity.detail,
        createdAt: activity.createdAt,
      })
      .from(activity)
      .innerJoin(users, eq(users.id, activity.actorId))
      .leftJoin(scenarios, eq(scenarios.id, activity.scenarioId))
      .where(where)
      .orderBy(desc(activity.createdAt), desc(activity.id))
      .limit(pageSize)
      .offset((page - 1) * pageSize),
    db.select({ n: count() }).from(activity).where(where),
  ]);
  return {
    items: rows.map((r) => ({
      id: r.id,
      action: r.action as ActivityAction,
      actor: { id: r.actorId, displayName: r.actorName },
      scenario: r.scenarioId === null ? null : { id: r.scenarioId, name: r.scenarioName ?? '' },
      detail: r.detail as ActivityEntry['detail'],
      createdAt: r.createdAt.toISOString(),
    })),
    page,
    pageSize,
    total: total?.n ?? 0,
  };
}
