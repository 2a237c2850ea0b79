import { and, eq, isNull, sql } from 'drizzle-orm';
import type { Application, Request, Response } from 'express';
import { sessions, users } from '../../drizzle/schema';
import type { Database } from '../db/database';
import type { AuthUser } from './user-store';

// Revoked access ends on sockets too (OWASP ASVS 4.0.3 V3.3.1: sign-out invalidates the session;
// V3.3.3: ending every session of a user ends all of them). Two halves, both here:
// - a notice: the routes that end sessions or change access call one hook, which disconnects the
//   sockets of that session or user through socket.io rooms. `disconnectSockets` on a room goes
//   through the namespace's adapter, so with @socket.io/postgres-adapter it reaches every node;
// - a check: every socket event reads the session row and the user row as they are now, so a
//   socket that missed the notice (another node, a change made outside the routes, an expired
//   session) is refused at its next event.

/** Room of every socket a user has open, on any of their sessions. */
export function userRoom(userId: number): string {
  return `user:${userId}`;
}

/** Room of every socket opened under one cookie session. */
export function sessionRoom(sessionId: string): string {
  return `session:${sessionId}`;
}

/** Told to a socket whose session ended or whose access changed, just before it is disconnected. */
export const SESSION_ENDED_MESSAGE = 'Your session has ended or your access changed (signed out, password reset, removed from the team, or a new role). Sign in again to continue.';

/** Answer to an event whose session could not be checked because PostgreSQL did not answer. */
export const SESSION_UNCHECKED_MESSAGE = 'The server could not check your session just now (its database did not answer), so this request was not carried out; a run already going keeps running. Try again shortly.';

/** Longest a per-event session check waits for PostgreSQL before answering that it could not check, ms. */
export const SESSION_CHECK_TIMEOUT_MS = 2000;

/** What a socket carries from its handshake to be checked again later. */
export interface SocketSessionRef {
  userId: number;
  sessionId: string;
  generation: number;
}

export type SessionCheck = { status: 'current'; user: AuthUser } | { status: 'revoked' } | { status: 'unavailable'; error: unknown };

/**
 * The session and the user as they are now: the session row exists, is unexpired and still holds
 * this user; the user is active and still at the generation the socket was opened under. The user
 * comes back with the team and role of now. A database that fails or does not answer within
 * `timeoutMs` gives 'unavailable', never a hang.
 * @param timeoutMs ms
 */
export async function checkSocketSession(db: Database, ref: SocketSessionRef, timeoutMs = SESSION_CHECK_TIMEOUT_MS): Promise<SessionCheck> {
  const lookup = db
    .select({ id: users.id, teamId: users.teamId, email: users.email, displayName: users.displayName, role: users.role, sessionGeneration: users.sessionGeneration })
    .from(users)
    .innerJoin(
      sessions,
      and(
        eq(sessions.sid, ref.sessionId),
        // The same comparison connect-pg-simple makes when it reads a session.
        sql`${sessions.expire} > now()`,
        // passport keeps { id, generation }; sessions from before generations hold the bare id.
        sql`coalesce(${sessions.sess} #>> '{passport,user,id}', ${sessions.sess} #>> '{passport,user}') = ${users.id}::text`,
      ),
    )
    .where(and(eq(users.id, ref.userId), isNull(users.deactivatedAt), eq(users.sessionGeneration, ref.generation)))
    .then(([row]): SessionCheck => (row ? { status: 'current', user: row } : { status: 'revoked' }));
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<SessionCheck>((resolve) => {
    timer = setTimeout(() => resolve({ status: 'unavailable', error: new Error(`no answer from the database within ${timeoutMs} ms`) }), timeoutMs);
  });
  try {
    return await Promise.race([lookup.catch((error: unknown): SessionCheck => ({ status: 'unavailable', error })), timeout]);
  } finally {
    clearTimeout(timer);
  }
}

/** The session reference of a socket's handshake request, once passport has put the user on it. */
export function handshakeSession(request: unknown): SocketSessionRef | null {
  const { user, sessionID } = request as { user?: AuthUser; sessionID?: string };
  if (!user || typeof sessionID !== 'string') return null;
  return { userId: user.id, sessionId: sessionID, generation: user.sessionGeneration };
}

/** Whatever holds the sockets (the run namespace): ends every socket in a room, telling it why. */
export interface SocketRevoker {
  endSockets(room: string, message: string): void;
}

const revokers = new WeakMap<Application, SocketRevoker[]>();

/** Lets the hooks below reach the sockets of this app (create-app.ts calls it once per namespace). */
export function revokeSocketsThrough(app: Application, revoker: SocketRevoker): void {
  revokers.set(app, [...(revokers.get(app) ?? []), revoker]);
}

function endSockets(req: Request, room: string): void {
  for (const revoker of revokers.get(req.app) ?? []) revoker.endSockets(room, SESSION_ENDED_MESSAGE);
}

/**
 * Hook for sign-out: ends the sockets of the session this request came in on once the answer has
 * gone out successfully. The id is taken now because passport's logout regenerates it.
 */
export function endThisSessionsSockets(req: Request, res: Response): void {
  const sessionId = req.sessionID;
  if (typeof sessionId !== 'string') return;
  res.once('finish', () => {
    if (res.statusCode < 400) endSockets(req, sessionRoom(sessionId));
  });
}

/**
 * Hook for whatever ends or changes a user's access (sign-out everywhere, password reset,
 * removal or deactivation, a role change): ends every socket of that user at once. Call it after
 * the change is committed, so a socket that reconnects straight away meets the new state.
 */
export function endUserSockets(req: Request, userId: number): void {
  endSockets(req, userRoom(userId));
}
