import type { LibraryDetail } from '../../shared/protocol/library-api';
import type { AuthUser } from '../auth/user-store';
import type { Database } from '../db/database';
import { AppError } from '../http/app-error';
import { accessFor } from './scenario-access';
import { loadScenario, storedDocument, type StoredScenario } from './scenario-store';

/** The same words for a missing id and another team's id: nothing about other teams leaks. */
export function scenarioNotFound(id: number): AppError {
  return AppError.notFound(`There is no scenario ${id} in your team's library.`);
}

export function revisionNotFound(scenarioId: number, number: number): AppError {
  return AppError.notFound(`Scenario ${scenarioId} has no revision ${number}.`);
}

/** A scenario of the user's team, or 404. */
export async function requireScenario(db: Database, user: AuthUser, id: number): Promise<StoredScenario> {
  const row = await loadScenario(db, user.teamId, id);
  if (!row) throw scenarioNotFound(id);
  return row;
}

/** GET /api/scenarios/:id's answer: the newest revision, its status and what the user may do. */
export async function libraryDetail(db: Database, user: AuthUser, id: number): Promise<LibraryDetail> {
  const row = await requireScenario(db, user, id);
  const { teamId: _teamId, document, archivedAt, ...item } = row;
  return {
    ...item,
    scenario: storedDocument(document, `scenario ${id}`),
    archivedAt: archivedAt?.toISOString() ?? null,
    access: await accessFor(db, user, id, row),
  };
}
