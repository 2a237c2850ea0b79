import { and, eq } from 'drizzle-orm';
import { handoffs } from '../../drizzle/schema';
import { ARCHIVED_REFUSES, archivedScenarioMessage, type ArchivedRefusal } from '../../shared/library/archived-scenario';
import type { ScenarioAccess } from '../../shared/protocol/library-api';
import { roleMay } from '../auth/permissions';
import type { AuthUser } from '../auth/user-store';
import type { Database } from '../db/database';
import { AppError } from '../http/app-error';

/** The facts of a scenario the access rules read. */
export interface AccessSubject {
  ownerId: number;
  archivedAt: Date | null;
}

/**
 * What a user may do with one scenario of their team: the role table first, then ownership.
 * Engineers and leads edit what they own or were handed for editing; admins edit anything of
 * their team; only the owner or an admin archives; an archived scenario is read-only until restored
 * (no edits, sign-off, comments or hand-offs; runs by id are refused by refuseIfArchived too).
 */
export function accessTo(user: AuthUser, subject: AccessSubject, handedForEditing: boolean): ScenarioAccess {
  const owns = subject.ownerId === user.id;
  const admin = user.role === 'admin';
  const live = subject.archivedAt === null;
  const handOff = live && roleMay(user.role, 'scenario.hand-off');
  return {
    edit: live && roleMay(user.role, 'scenario.edit') && (owns || admin || handedForEditing),
    archive: roleMay(user.role, 'scenario.archive') && (owns || admin),
    signOff: live && roleMay(user.role, 'revision.sign-off'),
    comment: live && roleMay(user.role, 'comment.write'),
    handOff,
    handOffEdit: handOff && (owns || admin),
  };
}

/** Whether the scenario was handed to the user with edit access. */
export async function handedForEditing(db: Pick<Database, 'select'>, scenarioId: number, userId: number): Promise<boolean> {
  const [row] = await db
    .select({ id: handoffs.id })
    .from(handoffs)
    .where(and(eq(handoffs.scenarioId, scenarioId), eq(handoffs.toUserId, userId), eq(handoffs.access, 'edit')));
  return row !== undefined;
}

export async function accessFor(db: Pick<Database, 'select'>, user: AuthUser, scenarioId: number, subject: AccessSubject): Promise<ScenarioAccess> {
  return accessTo(user, subject, await handedForEditing(db, scenarioId, user.id));
}

/** The one refusal of an archived scenario: 409 'archived' with the words of ARCHIVED_REFUSES. */
export function archivedRefusal(doing: ArchivedRefusal): AppError {
  return new AppError(409, 'archived', archivedScenarioMessage(ARCHIVED_REFUSES[doing]));
}

/** Throws archivedRefusal for an archived scenario (runs by id, comments, hand-offs, sign-off). */
export function refuseIfArchived(subject: AccessSubject, doing: ArchivedRefusal): void {
  if (subject.archivedAt !== null) throw archivedRefusal(doing);
}

/** 409 for an archived scenario, 403 for the rest of what the rules refuse. */
export function refuseUnless(allowed: boolean, subject: AccessSubject, what: string): void {
  if (allowed) return;
  if (subject.archivedAt !== null) throw new AppError(409, 'archived', archivedScenarioMessage(`you ${what}`));
  throw new AppError(403, 'forbidden', `You may not ${what} this scenario: it is not yours and was not handed to you for editing.`);
}
