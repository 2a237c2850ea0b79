import { and, eq, isNull } from 'drizzle-orm';
import { scenarioRevisions, users } from '../../drizzle/schema';
import { diffScenarios } from '../../shared/library/scenario-diff';
import {
  SAFETY_CAUTION,
  diffQuerySchema,
  revisionRestoreSchema,
  signOffSchema,
  type RevisionDiff,
  type StaleSaveBody,
} from '../../shared/protocol/library-api';
import { userOf } from '../auth/require-user';
import type { GuardedRouter } from '../auth/route-table';
import { AppError } from '../http/app-error';
import { recordActivity } from '../library/activity-log';
import { scenarioLink, type LibraryDeps } from '../library/library-deps';
import { bodyOf, idParam, queryOf } from '../library/request-input';
import { signOffMail } from '../mail/mail-templates';
import { accessFor, refuseIfArchived, refuseUnless } from './scenario-access';
import { libraryDetail, requireScenario, revisionNotFound, scenarioNotFound } from './scenario-detail';
import { appendRevision, findRevision, listRevisions, lockScenario } from './revision-store';

/** Revisions: list, open read-only, restore as the newest, diff two, sign off one. */
export function revisionRoutes({ route }: GuardedRouter, { db, mailer, appBaseUrl }: LibraryDeps): void {
  route('get', '/:id/revisions', 'scenario.read', async (req, res) => {
    const id = idParam(req, 'id', 'scenario id');
    await requireScenario(db, userOf(req), id);
    res.json({ items: await listRevisions(db, id) });
  });

  route('get', '/:id/revisions/:n', 'scenario.read', async (req, res) => {
    const id = idParam(req, 'id', 'scenario id');
    const n = idParam(req, 'n', 'revision number');
    await requireScenario(db, userOf(req), id);
    const revision = await findRevision(db, id, n);
    if (!revision) throw revisionNotFound(id, n);
    const { id: _rowId, ...detail } = revision;
    res.json(detail);
  });

  route('get', '/:id/diff', 'scenario.read', async (req, res) => {
    const id = idParam(req, 'id', 'scenario id');
    const query = queryOf(req, diffQuerySchema);
    await requireScenario(db, userOf(req), id);
    const [from, to] = await Promise.all([findRevision(db, id, query.from), findRevision(db, id, query.to)]);
    if (!from) throw revisionNotFound(id, query.from);
    if (!to) throw revisionNotFound(id, query.to);
    const strip = ({ id: _i, scenarioId: _s, scenario: _d, ...summary }: typeof from) => summary;
    const body: RevisionDiff = { from: strip(from), to: strip(to), changes: diffScenarios(from.scenario, to.scenario) };
    res.json(body);
  });

  route('post', '/:id/revisions/:n/restore', 'scenario.edit', async (req, res) => {
    const user = userOf(req);
    const id = idParam(req, 'id', 'scenario id');
    const n = idParam(req, 'n', 'revision number');
    const body = bodyOf(req, revisionRestoreSchema, 'The restore request is not valid; nothing was saved.');
    const outcome = await db.transaction(async (tx) => {
      const row = await lockScenario(tx, user.teamId, id);
      if (!row) throw scenarioNotFound(id);
      refuseUnless((await accessFor(tx, user, id, row)).edit, row, 'restore a revision of');
      const source = await findRevision(tx, id, n);
      if (!source) throw revisionNotFound(id, n);
      const note = body.note || `Restored revision ${n}`;
      if (row.headRevision !== body.baseRevision) {
        const { id: _c, ...current } = (await findRevision(tx, id, row.headRevision))!;
        const stale: StaleSaveBody = {
          error: { code: 'stale_revision', message: `Revision ${row.headRevision} was saved after revision ${body.baseRevision}; look at it before restoring revision ${n}. Nothing was saved.` },
          current,
          yours: { baseRevision: body.baseRevision, scenario: source.scenario, note },
        };
        return { stale };
      }
      const number = await appendRevision(tx, id, row.headRevision, source.scenario, note, user.id);
      await recordActivity(tx, { teamId: user.teamId, actorId: user.id, action: 'scenario.restored', scenarioId: id, detail: { revision: number, restored: n } });
      return { stale: null };
    });
    if (outcome.stale) return void res.status(409).json(outcome.stale);
    res.json(await libraryDetail(db, user, id));
  });

  // Sign-off marks one revision as reviewed; the database refuses any later change to it, and
  // a later save simply starts a new, unsigned revision.
  route('post', '/:id/revisions/:n/sign-off', 'revision.sign-off', async (req, res) => {
    const user = userOf(req);
    const id = idParam(req, 'id', 'scenario id');
    const n = idParam(req, 'n', 'revision number');
    const body = bodyOf(req, signOffSchema, `Sign-off needs the safety caution acknowledged: ${SAFETY_CAUTION}`);
    const signed = await db.transaction(async (tx) => {
      const row = await lockScenario(tx, user.teamId, id);
      if (!row) throw scenarioNotFound(id);
      refuseIfArchived(row, 'signOff');
      const [revision] = await tx
        .select({ id: scenarioRevisions.id, signedOffAt: scenarioRevisions.signedOffAt })
        .from(scenarioRevisions)
        .where(and(eq(scenarioRevisions.scenarioId, id), eq(scenarioRevisions.number, n)))
        .for('update');
      if (!revision) throw revisionNotFound(id, n);
      if (revision.signedOffAt) throw new AppError(409, 'already_signed_off', `Revision ${n} is already signed off and cannot change.`);
      await tx
        .update(scenarioRevisions)
        .set({ signedOffBy: user.id, signedOffAt: new Date(), signOffNote: body.note })
        .where(and(eq(scenarioRevisions.id, revision.id), isNull(scenarioRevisions.signedOffAt)));
      await recordActivity(tx, { teamId: user.teamId, actorId: user.id, action: 'revision.signed-off', scenarioId: id, detail: { revision: n, safetyAcknowledged: true } });
      const [owner] = await tx.select({ email: users.email }).from(users).where(and(eq(users.id, row.ownerId), isNull(users.deactivatedAt)));
      return { name: row.name, ownerEmail: row.ownerId === user.id ? null : (owner?.email ?? null) };
    });
    if (signed.ownerEmail) {
      await mailer.send(signed.ownerEmail, signOffMail({ lead: user.displayName, scenarioName: signed.name, revision: n, note: body.note, url: scenarioLink(appBaseUrl(), id, n) }), user.teamId);
    }
    const revision = (await findRevision(db, id, n))!;
    const { id: _rowId, ...detail } = revision;
    res.json({ revision: detail, safetyCaution: SAFETY_CAUTION });
  });
}
