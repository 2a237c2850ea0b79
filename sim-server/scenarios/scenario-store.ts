import { and, desc, eq } from 'drizzle-orm';
import { scenarios, users } from '../../drizzle/schema';
import type { ScenarioDetail, ScenarioSummary } from '../../shared/protocol/api-types';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import { describeFieldErrors } from '../../shared/validation/field-errors';
import type { Database } from '../db/database';

const summaryColumns = { id: scenarios.id, name: scenarios.name, ownerName: users.displayName, updatedAt: scenarios.updatedAt };

/** The team's scenarios, most recently changed first. */
export async function listTeamScenarios(db: Database, teamId: number): Promise<ScenarioSummary[]> {
  const rows = await db
    .select(summaryColumns)
    .from(scenarios)
    .innerJoin(users, eq(users.id, scenarios.ownerId))
    .where(eq(scenarios.teamId, teamId))
    .orderBy(desc(scenarios.updatedAt), scenarios.id);
  return rows.map((row) => ({ ...row, updatedAt: row.updatedAt.toISOString() }));
}

/** One scenario of the team, or null when it does not exist or belongs to another team. */
export async function findTeamScenario(db: Database, teamId: number, id: number): Promise<ScenarioDetail | null> {
  const [row] = await db
    .select({ ...summaryColumns, document: scenarios.document })
    .from(scenarios)
    .innerJoin(users, eq(users.id, scenarios.ownerId))
    .where(and(eq(scenarios.id, id), eq(scenarios.teamId, teamId)));
  if (!row) return null;
  // Stored documents were validated on the way in; parsing again also fills defaults added since.
  const parsed = parseScenario(row.document);
  if (!parsed.ok) throw new Error(`stored scenario ${id} no longer validates: ${describeFieldErrors(parsed.errors)}`);
  return { id: row.id, name: row.name, ownerName: row.ownerName, updatedAt: row.updatedAt.toISOString(), scenario: parsed.value };
}
