import type { Transport } from 'nodemailer';
import { outbox } from '../../drizzle/schema';
import type { Database } from '../db/database';

/** The fields of a message as nodemailer hands them to a transport (its `mail.data`). */
interface OutboxMessage {
  from?: unknown;
  to?: unknown;
  subject?: unknown;
  text?: unknown;
  html?: unknown;
  teamId?: number | null;
}

/**
 * The default nodemailer transport: every message becomes a row of the outbox table, where admins
 * read it at /api/dev/mailbox. Nothing leaves the machine; the code that sends is the same as
 * with SMTP.
 */
export function createOutboxTransport(db: Database): Transport<{ messageId: string }> {
  return {
    name: 'kinetwin-outbox',
    version: '1',
    send(mail, callback) {
      const data = mail.data as OutboxMessage;
      // nodemailer generates the Message-ID; keep it so a message can be traced end to end.
      const messageId = mail.message.messageId();
      db.insert(outbox)
        .values({
          teamId: data.teamId ?? null,
          messageId,
          fromAddress: String(data.from ?? ''),
          toAddress: String(data.to ?? ''),
          subject: String(data.subject ?? ''),
          text: String(data.text ?? ''),
          html: String(data.html ?? ''),
        })
        .then(() => callback(null, { messageId }))
        .catch((err: Error) => callback(err, { messageId }));
    },
  };
}
