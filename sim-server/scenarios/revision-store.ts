import { and, asc, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { scenarioRevisions, scenarios, users } from '../../drizzle/schema';
import type { RevisionDetail, RevisionSummary } from '../../shared/protocol/library-api';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import type { Database } from '../db/database';
import { storedDocument } from './scenario-store';

export type Transaction = Parameters<Parameters<Database['transaction']>[0]>[0];

const author = alias(users, 'author');
const signer = alias(users, 'signer');

const revisionColumns = {
  id: scenarioRevisions.id,
  scenarioId: scenarioRevisions.scenarioId,
  number: scenarioRevisions.number,
  note: scenarioRevisions.note,
  createdAt: scenarioRevisions.createdAt,
  authorId: author.id,
  authorName: author.displayName,
  signedOffAt: scenarioRevisions.signedOffAt,
  signOffNote: scenarioRevisions.signOffNote,
  signerId: signer.id,
  signerName: signer.displayName,
};

interface RevisionRow {
  number: number;
  note: string;
  createdAt: Date;
  authorId: number;
  authorName: string;
  signedOffAt: Date | null;
  signOffNote: string | null;
  signerId: number | null;
  signerName: string | null;
}

function toSummary(r: RevisionRow): RevisionSummary {
  return {
    number: r.number,
    note: r.note,
    author: { id: r.authorId, displayName: r.authorName },
    createdAt: r.createdAt.toISOString(),
    signOff: r.signedOffAt && r.signerId !== null ? { by: { id: r.signerId, displayName: r.signerName ?? '' }, at: r.signedOffAt.toISOString(), note: r.signOffNote ?? '' } : null,
  };
}

/** Every revision of a scenario (already checked to be the caller's team's), oldest first. */
export async function listRevisions(db: Database, scenarioId: number): Promise<RevisionSummary[]> {
  const rows = await db
    .select(revisionColumns)
    .from(scenarioRevisions)
    .innerJoin(author, eq(author.id, scenarioRevisions.authorId))
    .leftJoin(signer, eq(signer.id, scenarioRevisions.signedOffBy))
    .where(eq(scenarioRevisions.scenarioId, scenarioId))
    .orderBy(asc(scenarioRevisions.number));
  return rows.map(toSummary);
}

/** One revision with its document, read-only, plus its row id; null when there is no such number. */
export async function findRevision(db: Pick<Database, 'select'>, scenarioId: number, number: number): Promise<(RevisionDetail & { id: number }) | null> {
  const [row] = await db
    .select({ ...revisionColumns, document: scenarioRevisions.document })
    .from(scenarioRevisions)
    .innerJoin(author, eq(author.id, scenarioRevisions.authorId))
    .leftJoin(signer, eq(signer.id, scenarioRevisions.signedOffBy))
    .where(and(eq(scenarioRevisions.scenarioId, scenarioId), eq(scenarioRevisions.number, number)));
  if (!row) return null;
  return { ...toSummary(row), id: row.id, scenarioId, scenario: storedDocument(row.document, `revision ${number} of scenario ${scenarioId}`) };
}

/** Locks the scenario row for the rest of the transaction; null when it is not the team's. */
export async function lockScenario(tx: Transaction, teamId: number, id: number) {
  const [row] = await tx
    .select({ id: scenarios.id, ownerId: scenarios.ownerId, archivedAt: scenarios.archivedAt, headRevision: scenarios.headRevision, name: scenarios.name, tags: scenarios.tags })
    .from(scenarios)
    .where(and(eq(scenarios.id, id), eq(scenarios.teamId, teamId)))
    .for('update');
  return row ?? null;
}

/**
 * Appends the next revision of a locked scenario and makes it the head: the scenario row takes
 * its number and name (its document is read from the revision). Earlier revisions (signed off
 * or not) are never touched.
 */
export async function appendRevision(tx: Transaction, scenarioId: number, headRevision: number, document: Scenario, note: string, authorId: number): Promise<number> {
  const number = headRevision + 1;
  await tx.insert(scenarioRevisions).values({ scenarioId, number, document, note, authorId });
  await tx
    .update(scenarios)
    .set({ name: document.name, headRevision: number, updatedAt: sql`now()` })
    .where(eq(scenarios.id, scenarioId));
  return number;
}

/** Creates a scenario with its first revision (a demo key for the seed's own scenarios). */
export async function insertScenario(tx: Transaction, teamId: number, ownerId: number, document: Scenario, note: string, tags: string[], demoKey: string | null = null): Promise<number> {
  const [row] = await tx.insert(scenarios).values({ teamId, ownerId, name: document.name, tags, headRevision: 1, demoKey }).returning({ id: scenarios.id });
  await tx.insert(scenarioRevisions).values({ scenarioId: row!.id, number: 1, document, note, authorId: ownerId });
  return row!.id;
}
