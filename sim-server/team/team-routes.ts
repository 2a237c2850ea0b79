import { and, asc, eq, gt, isNull, ne, sql } from 'drizzle-orm';
import { invitations, teams, users } from '../../drizzle/schema';
import { invitationCreateSchema, memberRoleSchema, type InvitationSummary, type TeamResponse } from '../../shared/protocol/library-api';
import { newLinkToken } from '../auth/link-tokens';
import { userOf } from '../auth/require-user';
import type { GuardedRouter } from '../auth/route-table';
import { endUserSockets } from '../auth/session-revocation';
import type { AuthUser } from '../auth/user-store';
import { AppError } from '../http/app-error';
import { recordActivity } from '../library/activity-log';
import type { LibraryDeps } from '../library/library-deps';
import { bodyOf, idParam } from '../library/request-input';
import { invitationMail } from '../mail/mail-templates';
import type { Transaction } from '../scenarios/revision-store';

export interface TeamRouteOptions extends LibraryDeps {
  invitationTtlHours: number;
}

/** The team: members (everyone reads, admins change roles and remove) and invitations (admins). */
export function teamRoutes({ route }: GuardedRouter, { db, mailer, appBaseUrl, invitationTtlHours }: TeamRouteOptions): void {
  route('get', '/', 'team.read', async (req, res) => {
    const user = userOf(req);
    const [team] = await db.select({ id: teams.id, name: teams.name }).from(teams).where(eq(teams.id, user.teamId));
    const members = await db
      .select({ id: users.id, email: users.email, displayName: users.displayName, role: users.role, createdAt: users.createdAt })
      .from(users)
      .where(and(eq(users.teamId, user.teamId), isNull(users.deactivatedAt)))
      .orderBy(asc(users.displayName), asc(users.id));
    const body: TeamResponse = { team: team!, members: members.map(({ createdAt, ...m }) => ({ ...m, joinedAt: createdAt.toISOString() })) };
    res.json(body);
  });

  route('patch', '/members/:memberId', 'team.manage', async (req, res) => {
    const admin = userOf(req);
    const memberId = idParam(req, 'memberId', 'member id');
    const { role } = bodyOf(req, memberRoleSchema, 'The role change is not valid.');
    await db.transaction(async (tx) => {
      const member = await lockMember(tx, admin, memberId);
      if (member.role === role) return;
      if (member.role === 'admin') await keepAnAdmin(tx, admin.teamId, memberId, 'change the role of');
      await tx.update(users).set({ role }).where(eq(users.id, memberId));
      await recordActivity(tx, { teamId: admin.teamId, actorId: admin.id, action: 'member.role-changed', detail: { member: member.displayName, from: member.role, to: role } });
    });
    endUserSockets(req, memberId);
    res.json({ id: memberId, role });
  });

  // Removing keeps the account's authorship (revisions, comments) and ends its sessions.
  route('delete', '/members/:memberId', 'team.manage', async (req, res) => {
    const admin = userOf(req);
    const memberId = idParam(req, 'memberId', 'member id');
    if (memberId === admin.id) throw new AppError(409, 'self', 'You cannot remove yourself; ask another admin.');
    await db.transaction(async (tx) => {
      const member = await lockMember(tx, admin, memberId);
      if (member.role === 'admin') await keepAnAdmin(tx, admin.teamId, memberId, 'remove');
      await tx
        .update(users)
        .set({ deactivatedAt: new Date(), sessionGeneration: sql`${users.sessionGeneration} + 1` })
        .where(eq(users.id, memberId));
      await recordActivity(tx, { teamId: admin.teamId, actorId: admin.id, action: 'member.removed', detail: { member: member.displayName } });
    });
    endUserSockets(req, memberId);
    res.status(204).end();
  });

  route('get', '/invitations', 'team.manage', async (req, res) => {
    const admin = userOf(req);
    const rows = await db
      .select({ id: invitations.id, email: invitations.email, role: invitations.role, invitedBy: users.displayName, expiresAt: invitations.expiresAt, createdAt: invitations.createdAt })
      .from(invitations)
      .innerJoin(users, eq(users.id, invitations.invitedBy))
      .where(and(eq(invitations.teamId, admin.teamId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
      .orderBy(asc(invitations.createdAt));
    const items: InvitationSummary[] = rows.map((r) => ({ ...r, expiresAt: r.expiresAt.toISOString(), createdAt: r.createdAt.toISOString() }));
    res.json({ items });
  });

  route('post', '/invitations', 'team.manage', async (req, res) => {
    const admin = userOf(req);
    const body = bodyOf(req, invitationCreateSchema, 'The invitation is not valid; nothing was sent.');
    const [member] = await db
      .select({ id: users.id })
      .from(users)
      .where(and(eq(users.teamId, admin.teamId), eq(users.email, body.email), isNull(users.deactivatedAt)));
    if (member) throw new AppError(409, 'already_member', `${body.email} is already a member of your team.`, [{ field: 'email', message: 'this address is already a member of your team' }]);
    const { token, hash } = newLinkToken();
    const expiresAt = new Date(Date.now() + invitationTtlHours * 3600_000);
    const [team] = await db.select({ name: teams.name }).from(teams).where(eq(teams.id, admin.teamId));
    const created = await db.transaction(async (tx) => {
      // A new invitation to the same address replaces the pending one: only the newest link works.
      await tx
        .update(invitations)
        .set({ revokedAt: new Date() })
        .where(and(eq(invitations.teamId, admin.teamId), eq(invitations.email, body.email), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
      const [row] = await tx.insert(invitations).values({ teamId: admin.teamId, email: body.email, role: body.role, tokenHash: hash, invitedBy: admin.id, expiresAt }).returning();
      await recordActivity(tx, { teamId: admin.teamId, actorId: admin.id, action: 'member.invited', detail: { email: body.email, role: body.role } });
      return row!;
    });
    const url = `${appBaseUrl()}/accept-invitation?token=${token}`;
    const sent = await mailer.send(body.email, invitationMail({ inviter: admin.displayName, teamName: team!.name, role: body.role, url, expiresAt }), admin.teamId);
    const summary: InvitationSummary & { emailSent: boolean } = {
      id: created.id,
      email: created.email,
      role: created.role,
      invitedBy: admin.displayName,
      expiresAt: created.expiresAt.toISOString(),
      createdAt: created.createdAt.toISOString(),
      emailSent: sent,
    };
    res.status(201).json(summary);
  });

  route('delete', '/invitations/:invitationId', 'team.manage', async (req, res) => {
    const admin = userOf(req);
    const invitationId = idParam(req, 'invitationId', 'invitation id');
    const [row] = await db
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitations.id, invitationId), eq(invitations.teamId, admin.teamId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
      .returning({ id: invitations.id });
    if (!row) throw AppError.notFound(`There is no pending invitation ${invitationId} in your team.`);
    res.status(204).end();
  });
}

async function lockMember(tx: Transaction, admin: AuthUser, memberId: number) {
  const [member] = await tx
    .select({ id: users.id, role: users.role, displayName: users.displayName })
    .from(users)
    .where(and(eq(users.id, memberId), eq(users.teamId, admin.teamId), isNull(users.deactivatedAt)))
    .for('update');
  if (!member) throw AppError.notFound(`There is no member ${memberId} in your team.`);
  return member;
}

/** A team always keeps at least one admin, or nobody could manage it again. */
async function keepAnAdmin(tx: Transaction, teamId: number, leavingId: number, what: string): Promise<void> {
  // Lock every admin row so two admins demoting each other at once cannot both succeed.
  const others = await tx
    .select({ id: users.id })
    .from(users)
    .where(and(eq(users.teamId, teamId), eq(users.role, 'admin'), isNull(users.deactivatedAt), ne(users.id, leavingId)))
    .for('update');
  if (others.length === 0) throw new AppError(409, 'last_admin', `You cannot ${what} the team's last admin; make another member admin first.`);
}
