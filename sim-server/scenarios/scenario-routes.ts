import type { Request, Response } from 'express';
import type { z } from 'zod';
import { eq, sql } from 'drizzle-orm';
import { scenarios } from '../../drizzle/schema';
import {
  libraryQuerySchema,
  SAFETY_CAUTION,
  SAFETY_CAUTION_HEADER,
  exportQuerySchema,
  scenarioCreateSchema,
  scenarioDuplicateSchema,
  scenarioImportSchema,
  scenarioPatchSchema,
  scenarioSaveSchema,
  type StaleSaveBody,
} from '../../shared/protocol/library-api';
import { scenarioFileText, scenarioOfFile } from '../../shared/scenario/scenario-file';
import { MAX_NAME_LENGTH } from '../../shared/scenario/scenario-schema';
import { userOf } from '../auth/require-user';
import type { GuardedRouter } from '../auth/route-table';
import { AppError } from '../http/app-error';
import { recordActivity } from '../library/activity-log';
import type { LibraryDeps } from '../library/library-deps';
import { bodyOf, idParam, queryOf } from '../library/request-input';
import { accessFor, refuseUnless } from './scenario-access';
import { libraryDetail, requireScenario, revisionNotFound, scenarioNotFound } from './scenario-detail';
import { scenarioFromBody } from './scenario-document';
import { listLibrary } from './scenario-store';
import { appendRevision, findRevision, insertScenario, lockScenario } from './revision-store';

/** The library: list, read, create, import, save (a revision), rename/tag, duplicate, archive, export. */
export function scenarioRoutes({ route }: GuardedRouter, { db }: LibraryDeps): void {
  route('get', '/', 'scenario.read', async (req, res) => {
    res.json(await listLibrary(db, userOf(req).teamId, queryOf(req, libraryQuerySchema)));
  });

  /** Create and import differ only in where the document sits, the default note and the activity. */
  const createFrom =
    <T extends { note?: string; tags: string[] }>(schema: z.ZodType<T>, refusal: string, field: 'scenario' | 'file', defaultNote: string, action: 'scenario.created' | 'scenario.imported') =>
    async (req: Request, res: Response) => {
      const user = userOf(req);
      const body = bodyOf(req, schema, refusal);
      const given = (body as Record<string, unknown>)[field];
      // An exported file carries its safety caution as a key of its own; the document is the rest.
      const document = scenarioFromBody(field === 'file' ? scenarioOfFile(given) : given, field);
      const id = await db.transaction(async (tx) => {
        const id = await insertScenario(tx, user.teamId, user.id, document, body.note || defaultNote, body.tags);
        await recordActivity(tx, { teamId: user.teamId, actorId: user.id, action, scenarioId: id, detail: { revision: 1 } });
        return id;
      });
      res.status(201).json(await libraryDetail(db, user, id));
    };

  route('post', '/', 'scenario.create', createFrom(scenarioCreateSchema, 'The new scenario is not valid; nothing was saved.', 'scenario', 'Created', 'scenario.created'));
  route('post', '/import', 'scenario.create', createFrom(scenarioImportSchema, 'The import is not valid; nothing was saved.', 'file', 'Imported from a scenario file', 'scenario.imported'));

  route('get', '/:id', 'scenario.read', async (req, res) => {
    res.json(await libraryDetail(db, userOf(req), idParam(req, 'id', 'scenario id')));
  });

  // A save is a new revision on top of the one the client started from; anything else is a 409
  // carrying both versions, so the client can merge or save a copy and nothing is lost.
  route('put', '/:id', 'scenario.edit', async (req, res) => {
    const user = userOf(req);
    const id = idParam(req, 'id', 'scenario id');
    const body = bodyOf(req, scenarioSaveSchema, 'The save is not valid; nothing was saved.');
    const document = scenarioFromBody(body.scenario, 'scenario');
    const outcome = await db.transaction(async (tx) => {
      const row = await lockScenario(tx, user.teamId, id);
      if (!row) throw scenarioNotFound(id);
      refuseUnless((await accessFor(tx, user, id, row)).edit, row, 'edit');
      if (row.headRevision !== body.baseRevision) {
        const current = await findRevision(tx, id, row.headRevision);
        const { id: _rowId, ...currentDetail } = current!;
        const stale: StaleSaveBody = {
          error: { code: 'stale_revision', message: `Revision ${row.headRevision} was saved after revision ${body.baseRevision}, which your edit started from. Nothing was saved: merge your changes into revision ${row.headRevision} or save them as a copy.` },
          current: currentDetail,
          yours: { baseRevision: body.baseRevision, scenario: document, note: body.note },
        };
        return { stale };
      }
      const number = await appendRevision(tx, id, row.headRevision, document, body.note, user.id);
      await recordActivity(tx, { teamId: user.teamId, actorId: user.id, action: 'scenario.saved', scenarioId: id, detail: { revision: number } });
      return { stale: null };
    });
    if (outcome.stale) return void res.status(409).json(outcome.stale);
    res.json(await libraryDetail(db, user, id));
  });

  // Renaming changes the document's name, so it is a revision; tags live beside the document.
  route('patch', '/:id', 'scenario.edit', async (req, res) => {
    const user = userOf(req);
    const id = idParam(req, 'id', 'scenario id');
    const body = bodyOf(req, scenarioPatchSchema, 'The change is not valid; nothing was saved.');
    await db.transaction(async (tx) => {
      const row = await lockScenario(tx, user.teamId, id);
      if (!row) throw scenarioNotFound(id);
      refuseUnless((await accessFor(tx, user, id, row)).edit, row, 'rename or tag');
      if (body.name !== undefined && body.name !== row.name) {
        const current = await findRevision(tx, id, row.headRevision);
        if (!current) throw scenarioNotFound(id);
        const number = await appendRevision(tx, id, row.headRevision, { ...current.scenario, name: body.name }, `Renamed from "${row.name}"`, user.id);
        await recordActivity(tx, { teamId: user.teamId, actorId: user.id, action: 'scenario.renamed', scenarioId: id, detail: { revision: number, from: row.name, to: body.name } });
      }
      if (body.tags !== undefined && body.tags.join('\n') !== row.tags.join('\n')) {
        await tx.update(scenarios).set({ tags: body.tags, updatedAt: sql`now()` }).where(eq(scenarios.id, id));
        await recordActivity(tx, { teamId: user.teamId, actorId: user.id, action: 'scenario.tagged', scenarioId: id, detail: { tags: body.tags.join(', ') } });
      }
    });
    res.json(await libraryDetail(db, user, id));
  });

  route('post', '/:id/duplicate', 'scenario.duplicate', async (req, res) => {
    const user = userOf(req);
    const id = idParam(req, 'id', 'scenario id');
    const body = bodyOf(req, scenarioDuplicateSchema, 'The duplicate request is not valid.');
    const source = await requireScenario(db, user, id);
    const number = body.revision ?? source.revision;
    const revision = await findRevision(db, id, number);
    if (!revision) throw revisionNotFound(id, number);
    const name = body.name ?? `${revision.scenario.name} (copy)`.slice(0, MAX_NAME_LENGTH);
    const copyId = await db.transaction(async (tx) => {
      const copyId = await insertScenario(tx, user.teamId, user.id, { ...revision.scenario, name }, `Duplicated from "${source.name}" revision ${number}`, source.tags);
      await recordActivity(tx, { teamId: user.teamId, actorId: user.id, action: 'scenario.duplicated', scenarioId: copyId, detail: { fromScenario: id, fromRevision: number } });
      return copyId;
    });
    res.status(201).json(await libraryDetail(db, user, copyId));
  });

  for (const [path, archive] of [
    ['/:id/archive', true],
    ['/:id/unarchive', false],
  ] as const) {
    route('post', path, 'scenario.archive', async (req, res) => {
      const user = userOf(req);
      const id = idParam(req, 'id', 'scenario id');
      await db.transaction(async (tx) => {
        const row = await lockScenario(tx, user.teamId, id);
        if (!row) throw scenarioNotFound(id);
        if (!(await accessFor(tx, user, id, row)).archive) {
          throw new AppError(403, 'forbidden', `Only the owner or an admin may ${archive ? 'archive' : 'restore'} this scenario.`);
        }
        if ((row.archivedAt !== null) === archive) return; // already as asked: nothing to record
        await tx.update(scenarios).set({ archivedAt: archive ? sql`now()` : null, updatedAt: sql`now()` }).where(eq(scenarios.id, id));
        await recordActivity(tx, { teamId: user.teamId, actorId: user.id, action: archive ? 'scenario.archived' : 'scenario.unarchived', scenarioId: id });
      });
      res.json(await libraryDetail(db, user, id));
    });
  }

  // The file is our scenario JSON with the safety caution as its first key (import drops it), so
  // the caution stays with the gains once the file is saved; the header lets the app show it first.
  route('get', '/:id/export', 'scenario.export', async (req, res) => {
    const user = userOf(req);
    const id = idParam(req, 'id', 'scenario id');
    const query = queryOf(req, exportQuerySchema);
    const row = await requireScenario(db, user, id);
    const number = query.revision ?? row.revision;
    const revision = await findRevision(db, id, number);
    if (!revision) throw revisionNotFound(id, number);
    await recordActivity(db, { teamId: user.teamId, actorId: user.id, action: 'scenario.exported', scenarioId: id, detail: { revision: number } });
    const fileName = `${revision.scenario.name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'scenario'}-r${number}.json`;
    res
      .set(SAFETY_CAUTION_HEADER, SAFETY_CAUTION)
      .set('content-disposition', `attachment; filename="${fileName}"`)
      .type('application/json')
      .send(scenarioFileText(revision.scenario, SAFETY_CAUTION));
  });
}

