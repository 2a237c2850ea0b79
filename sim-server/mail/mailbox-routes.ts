import { desc, eq } from 'drizzle-orm';
import { outbox } from '../../drizzle/schema';
import type { Mailbox } from '../../shared/protocol/library-api';
import { userOf } from '../auth/require-user';
import type { GuardedRouter } from '../auth/route-table';
import type { Database } from '../db/database';

/** Most messages the dev mailbox lists. */
export const MAILBOX_LIMIT = 200;

/** GET /api/dev/mailbox: the outbox's messages to the admin's own team, newest first. */
export function mailboxRoutes({ route }: GuardedRouter, db: Database): void {
  route('get', '/mailbox', 'mailbox.read', async (req, res) => {
    const rows = await db
      .select()
      .from(outbox)
      .where(eq(outbox.teamId, userOf(req).teamId))
      .orderBy(desc(outbox.id))
      .limit(MAILBOX_LIMIT);
    const body: Mailbox = {
      items: rows.map((r) => ({ id: r.id, to: r.toAddress, from: r.fromAddress, subject: r.subject, text: r.text, html: r.html, createdAt: r.createdAt.toISOString() })),
    };
    res.json(body);
  });
}
