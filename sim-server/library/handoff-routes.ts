import { and, desc, eq, isNull } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { handoffs, scenarios, users } from '../../drizzle/schema';
import { handoffCreateSchema, type Handoff, type HandoffList } from '../../shared/protocol/library-api';
import { userOf } from '../auth/require-user';
import type { GuardedRouter } from '../auth/route-table';
import type { Database } from '../db/database';
import { AppError } from '../http/app-error';
import { handoffMail } from '../mail/mail-templates';
import { accessFor, refuseIfArchived } from '../scenarios/scenario-access';
import { requireScenario } from '../scenarios/scenario-detail';
import { recordActivity } from './activity-log';
import { scenarioLink, type LibraryDeps } from './library-deps';
import { bodyOf, idParam } from './request-input';

const sender = alias(users, 'sender');
const recipient = alias(users, 'recipient');

/** POST /api/scenarios/:id/handoffs: hand a scenario to a teammate, who gets an e-mail. */
export function scenarioHandoffRoutes({ route }: GuardedRouter, { db, mailer, appBaseUrl }: LibraryDeps): void {
  route('post', '/:id/handoffs', 'scenario.hand-off', async (req, res) => {
    const user = userOf(req);
    const id = idParam(req, 'id', 'scenario id');
    const body = bodyOf(req, handoffCreateSchema, 'The hand-off is not valid; nothing was sent.');
    const scenario = await requireScenario(db, user, id);
    const access = await accessFor(db, user, id, scenario);
    refuseIfArchived(scenario, 'handOff');
    if (body.access === 'edit' && !access.handOffEdit) throw new AppError(403, 'forbidden', 'Only the owner or an admin may hand this scenario off for editing; hand it off to view.');
    // Same words for an unknown id and another team's member: nothing about other teams leaks.
    const [to] = await db
      .select({ id: users.id, email: users.email, displayName: users.displayName, role: users.role })
      .from(users)
      .where(and(eq(users.id, body.toUserId), eq(users.teamId, user.teamId), isNull(users.deactivatedAt)));
    if (!to) throw AppError.badRequest('The hand-off has no recipient.', [{ field: 'toUserId', message: `there is no teammate with id ${body.toUserId}` }]);
    if (to.id === user.id) throw AppError.badRequest('You cannot hand a scenario to yourself.', [{ field: 'toUserId', message: 'choose a teammate other than yourself' }]);
    if (body.access === 'edit' && to.role === 'viewer') {
      throw AppError.badRequest('A viewer cannot edit.', [{ field: 'access', message: `${to.displayName} is a viewer and cannot edit; hand off to view, or ask an admin to change the role` }]);
    }
    const handoffId = await db.transaction(async (tx) => {
      const [row] = await tx
        .insert(handoffs)
        .values({ teamId: user.teamId, scenarioId: id, fromUserId: user.id, toUserId: to.id, access: body.access, message: body.message, revisionNumber: scenario.revision })
        .onConflictDoUpdate({
          target: [handoffs.scenarioId, handoffs.toUserId],
          set: { fromUserId: user.id, access: body.access, message: body.message, revisionNumber: scenario.revision, createdAt: new Date() },
        })
        .returning({ id: handoffs.id });
      await recordActivity(tx, { teamId: user.teamId, actorId: user.id, action: 'scenario.handed-off', scenarioId: id, detail: { to: to.displayName, access: body.access, revision: scenario.revision } });
      return row!.id;
    });
    await mailer.send(to.email, handoffMail({ from: user.displayName, scenarioName: scenario.name, access: body.access, message: body.message, url: scenarioLink(appBaseUrl(), id) }), user.teamId);
    const [created] = await listHandoffs(db, user.teamId, eq(handoffs.id, handoffId));
    res.status(201).json(created);
  });
}

/** GET /api/handoffs/received ("Handed to me") and /api/handoffs/sent. */
export function handoffListRoutes({ route }: GuardedRouter, { db }: LibraryDeps): void {
  route('get', '/received', 'handoff.read', async (req, res) => {
    const user = userOf(req);
    const body: HandoffList = { items: await listHandoffs(db, user.teamId, eq(handoffs.toUserId, user.id)) };
    res.json(body);
  });
  route('get', '/sent', 'handoff.read', async (req, res) => {
    const user = userOf(req);
    const body: HandoffList = { items: await listHandoffs(db, user.teamId, eq(handoffs.fromUserId, user.id)) };
    res.json(body);
  });
}

/** Hand-offs of the team matching `where`, of scenarios not archived, newest first. */
async function listHandoffs(db: Database, teamId: number, where: ReturnType<typeof eq>): Promise<Handoff[]> {
  const rows = await db
    .select({
      id: handoffs.id,
      scenarioId: scenarios.id,
      scenarioName: scenarios.name,
      fromId: sender.id,
      fromName: sender.displayName,
      toId: recipient.id,
      toName: recipient.displayName,
      access: handoffs.access,
      message: handoffs.message,
      revision: handoffs.revisionNumber,
      createdAt: handoffs.createdAt,
    })
    .from(handoffs)
    .innerJoin(scenarios, eq(scenarios.id, handoffs.scenarioId))
    .innerJoin(sender, eq(sender.id, handoffs.fromUserId))
    .innerJoin(recipient, eq(recipient.id, handoffs.toUserId))
    .where(and(eq(handoffs.teamId, teamId), isNull(scenarios.archivedAt), where))
    .orderBy(desc(handoffs.createdAt), desc(handoffs.id));
  return rows.map((r) => ({
    id: r.id,
    scenario: { id: r.scenarioId, name: r.scenarioName },
    from: { id: r.fromId, displayName: r.fromName },
    to: { id: r.toId, displayName: r.toName },
    access: r.access,
    message: r.message,
    revision: r.revision,
    createdAt: r.createdAt.toISOString(),
  }));
}
