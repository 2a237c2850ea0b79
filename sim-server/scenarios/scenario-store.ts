import { and, asc, count, desc, eq, ilike, isNotNull, isNull, or, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { scenarioRevisions, scenarios, users } from '../../drizzle/schema';
import type { LibraryItem, LibraryPage, ParsedLibraryQuery, ScenarioStatus, SignOff } from '../../shared/protocol/library-api';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { describeFieldErrors } from '../../shared/validation/field-errors';
import type { Database } from '../db/database';

const head = alias(scenarioRevisions, 'head');
const lastAuthor = alias(users, 'last_author');
const signer = alias(users, 'signer');

const statusExpr = sql<ScenarioStatus>`CASE WHEN ${scenarios.archivedAt} IS NOT NULL THEN 'archived' WHEN ${head.signedOffAt} IS NOT NULL THEN 'signed-off' ELSE 'draft' END`;

const itemColumns = {
  id: scenarios.id,
  name: scenarios.name,
  ownerName: users.displayName,
  ownerId: scenarios.ownerId,
  updatedAt: scenarios.updatedAt,
  lastChangedBy: lastAuthor.displayName,
  status: statusExpr,
  tags: scenarios.tags,
  revision: scenarios.headRevision,
};

function toItem(row: { updatedAt: Date } & Omit<LibraryItem, 'updatedAt'>): LibraryItem {
  return {
    id: row.id,
    name: row.name,
    ownerName: row.ownerName,
    ownerId: row.ownerId,
    updatedAt: row.updatedAt.toISOString(),
    lastChangedBy: row.lastChangedBy,
    status: row.status,
    tags: row.tags,
    revision: row.revision,
  };
}

// ILIKE treats % and _ as wildcards and \ as the escape: a search for "50%" means the text.
function containing(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** One page of the team's library, filtered, searched and sorted. */
export async function listLibrary(db: Database, teamId: number, query: ParsedLibraryQuery): Promise<LibraryPage> {
  const conditions: SQL[] = [eq(scenarios.teamId, teamId)];
  if (query.q) {
    const pattern = containing(query.q);
    conditions.push(or(ilike(scenarios.name, pattern), ilike(sql`${head.document}->>'notes'`, pattern))!);
  }
  if (query.tag) conditions.push(sql`${query.tag} = ANY(${scenarios.tags})`);
  if (query.owner) conditions.push(eq(scenarios.ownerId, query.owner));
  const status = query.status ?? 'active';
  if (status === 'archived') conditions.push(isNotNull(scenarios.archivedAt));
  else if (status !== 'all') conditions.push(isNull(scenarios.archivedAt));
  if (status === 'signed-off') conditions.push(isNotNull(head.signedOffAt));
  if (status === 'draft') conditions.push(isNull(head.signedOffAt));
  const where = and(...conditions);

  const order = query.order ?? (query.sort === 'updatedAt' ? 'desc' : 'asc');
  const direction = order === 'asc' ? asc : desc;
  const sortColumn = { updatedAt: scenarios.updatedAt, name: sql`lower(${scenarios.name})`, owner: sql`lower(${users.displayName})`, status: statusExpr }[query.sort];

  const [rows, [total]] = await Promise.all([
    db
      .select(itemColumns)
      .from(scenarios)
      .innerJoin(users, eq(users.id, scenarios.ownerId))
      .leftJoin(head, and(eq(head.scenarioId, scenarios.id), eq(head.number, scenarios.headRevision)))
      .leftJoin(lastAuthor, eq(lastAuthor.id, head.authorId))
      .where(where)
      .orderBy(direction(sortColumn), direction(scenarios.id))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db
      .select({ n: count() })
      .from(scenarios)
      .innerJoin(users, eq(users.id, scenarios.ownerId))
      .leftJoin(head, and(eq(head.scenarioId, scenarios.id), eq(head.number, scenarios.headRevision)))
      .where(where),
  ]);
  return { items: rows.map(toItem), page: query.page, pageSize: query.pageSize, total: total?.n ?? 0 };
}

/**
 * A scenario's library row with its head revision's document and sign-off, or null outside the
 * team. The document is read from the revision itself, the one record a sign-off covers: the
 * scenario row keeps no copy that could say something else.
 */
export interface StoredScenario extends LibraryItem {
  teamId: number;
  archivedAt: Date | null;
  document: unknown;
  signOff: SignOff | null;
}

export async function loadScenario(db: Database, teamId: number, id: number): Promise<StoredScenario | null> {
  const [row] = await db
    .select({
      ...itemColumns,
      teamId: scenarios.teamId,
      archivedAt: scenarios.archivedAt,
      document: head.document,
      signedOffAt: head.signedOffAt,
      signOffNote: head.signOffNote,
      signerId: signer.id,
      signerName: signer.displayName,
    })
    .from(scenarios)
    .innerJoin(users, eq(users.id, scenarios.ownerId))
    .leftJoin(head, and(eq(head.scenarioId, scenarios.id), eq(head.number, scenarios.headRevision)))
    .leftJoin(lastAuthor, eq(lastAuthor.id, head.authorId))
    .leftJoin(signer, eq(signer.id, head.signedOffBy))
    .where(and(eq(scenarios.id, id), eq(scenarios.teamId, teamId)));
  if (!row) return null;
  const { signedOffAt, signOffNote, signerId, signerName, ...rest } = row;
  return {
    ...toItem(rest),
    teamId: rest.teamId,
    archivedAt: rest.archivedAt,
    document: rest.document,
    signOff: signedOffAt && signerId !== null ? { by: { id: signerId, displayName: signerName ?? '' }, at: signedOffAt.toISOString(), note: signOffNote ?? '' } : null,
  };
}

/** A stored document parsed again (which also fills defaults added since it was saved). */
export function storedDocument(document: unknown, where: string): Scenario {
  const parsed = parseScenario(document);
  if (!parsed.ok) throw new Error(`stored ${where} no longer validates: ${describeFieldErrors(parsed.errors)}`);
  return parsed.value;
}
