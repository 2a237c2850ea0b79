import { and, asc, eq, inArray, isNull } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { comments, scenarioRevisions, users } from '../../drizzle/schema';
import { mentionedEmails } from '../../shared/library/mentions';
import { commentCreateSchema, commentsQuerySchema, type Comment, type CommentThreadList } from '../../shared/protocol/library-api';
import { userOf } from '../auth/require-user';
import type { GuardedRouter } from '../auth/route-table';
import type { Database } from '../db/database';
import { AppError } from '../http/app-error';
import { mentionMail } from '../mail/mail-templates';
import { refuseIfArchived } from '../scenarios/scenario-access';
import { requireScenario, revisionNotFound } from '../scenarios/scenario-detail';
import { recordActivity } from './activity-log';
import { scenarioLink, type LibraryDeps } from './library-deps';
import { bodyOf, idParam, queryOf } from './request-input';

const author = alias(users, 'comment_author');

/** Comments on revisions, threaded by parent, with @email mentions of teammates e-mailed. */
export function commentRoutes({ route }: GuardedRouter, { db, mailer, appBaseUrl }: LibraryDeps): void {
  route('get', '/:id/comments', 'comment.read', async (req, res) => {
    const id = idParam(req, 'id', 'scenario id');
    const query = queryOf(req, commentsQuerySchema);
    await requireScenario(db, userOf(req), id);
    const body: CommentThreadList = { items: await commentThreads(db, id, query.revision ?? null) };
    res.json(body);
  });

  route('post', '/:id/revisions/:n/comments', 'comment.write', async (req, res) => {
    const user = userOf(req);
    const id = idParam(req, 'id', 'scenario id');
    const n = idParam(req, 'n', 'revision number');
    const body = bodyOf(req, commentCreateSchema, 'The comment is not valid; nothing was saved.');
    const scenario = await requireScenario(db, user, id);
    refuseIfArchived(scenario, 'comment');
    const [revision] = await db
      .select({ id: scenarioRevisions.id })
      .from(scenarioRevisions)
      .where(and(eq(scenarioRevisions.scenarioId, id), eq(scenarioRevisions.number, n)));
    if (!revision) throw revisionNotFound(id, n);
    if (body.parentId !== undefined) {
      const [parent] = await db
        .select({ id: comments.id })
        .from(comments)
        .where(and(eq(comments.id, body.parentId), eq(comments.revisionId, revision.id)));
      if (!parent) throw AppError.badRequest('The reply has no parent here.', [{ field: 'parentId', message: `there is no comment ${body.parentId} on revision ${n} of this scenario` }]);
    }
    // Mentions resolve only against active teammates: an address outside the team is plain text.
    const emails = mentionedEmails(body.body);
    const mentioned = emails.length
      ? await db
          .select({ id: users.id, email: users.email, displayName: users.displayName })
          .from(users)
          .where(and(eq(users.teamId, user.teamId), inArray(users.email, emails), isNull(users.deactivatedAt)))
      : [];
    // In the order the body names them, so the stored list reads like the comment.
    mentioned.sort((a, b) => emails.indexOf(a.email) - emails.indexOf(b.email));
    const notified = mentioned.filter((m) => m.id !== user.id);
    const commentId = await db.transaction(async (tx) => {
      const [row] = await tx
        .insert(comments)
        .values({ scenarioId: id, revisionId: revision.id, parentId: body.parentId ?? null, authorId: user.id, body: body.body, mentionedUserIds: mentioned.map((m) => m.id) })
        .returning({ id: comments.id });
      await recordActivity(tx, { teamId: user.teamId, actorId: user.id, action: 'comment.added', scenarioId: id, detail: { revision: n, comment: row!.id, mentions: notified.length } });
      return row!.id;
    });
    for (const person of notified) {
      await mailer.send(person.email, mentionMail({ author: user.displayName, scenarioName: scenario.name, revision: n, body: body.body, url: scenarioLink(appBaseUrl(), id, n) }), user.teamId);
    }
    const created = (await commentThreads(db, id, n)).flatMap(function all(c): Comment[] {
      return [c, ...c.replies.flatMap(all)];
    });
    res.status(201).json(created.find((c) => c.id === commentId));
  });
}

/** A scenario's comments (on one revision, or all), oldest first, replies nested under parents. */
async function commentThreads(db: Database, scenarioId: number, revision: number | null): Promise<Comment[]> {
  const rows = await db
    .select({
      id: comments.id,
      revision: scenarioRevisions.number,
      parentId: comments.parentId,
      authorId: author.id,
      authorName: author.displayName,
      body: comments.body,
      mentionedUserIds: comments.mentionedUserIds,
      createdAt: comments.createdAt,
    })
    .from(comments)
    .innerJoin(scenarioRevisions, eq(scenarioRevisions.id, comments.revisionId))
    .innerJoin(author, eq(author.id, comments.authorId))
    .where(revision === null ? eq(comments.scenarioId, scenarioId) : and(eq(comments.scenarioId, scenarioId), eq(scenarioRevisions.number, revision)))
    .orderBy(asc(comments.createdAt), asc(comments.id));
  const ids = [...new Set(rows.flatMap((r) => r.mentionedUserIds))];
  const people = ids.length ? await db.select({ id: users.id, displayName: users.displayName }).from(users).where(inArray(users.id, ids)) : [];
  const byId = new Map<number, Comment>();
  const top: Comment[] = [];
  for (const r of rows) {
    const comment: Comment = {
      id: r.id,
      revision: r.revision,
      parentId: r.parentId,
      author: { id: r.authorId, displayName: r.authorName },
      body: r.body,
      mentions: r.mentionedUserIds.flatMap((id) => people.filter((p) => p.id === id)),
      createdAt: r.createdAt.toISOString(),
      replies: [],
    };
    byId.set(r.id, comment);
    // Parents are older than their replies, so a parent is always placed first.
    const parent = r.parentId === null ? undefined : byId.get(r.parentId);
    (parent ? parent.replies : top).push(comment);
  }
  return top;
}
