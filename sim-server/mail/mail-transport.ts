import nodemailer from 'nodemailer';
import type { Database } from '../db/database';
import { createOutboxTransport } from './outbox-transport';

/** One message as the mailer hands it to nodemailer; teamId files it in the right team's outbox. */
export interface MailMessage {
  from: string;
  to: string;
  subject: string;
  text: string;
  html: string;
  teamId?: number | null;
}

/** What the mailer sends through: a nodemailer transporter, whichever transport is behind it. */
export interface MailTransport {
  sendMail(message: MailMessage): Promise<{ messageId: string }>;
}

/**
 * The nodemailer transporter configuration asks for: real SMTP, or the local outbox plugged in as
 * a nodemailer transport. Either way messages go through nodemailer's own sendMail.
 */
export function createMailTransport(kind: 'smtp' | 'outbox', smtpUrl: string | null, db: Database): MailTransport {
  // nodemailer passes unknown message fields (teamId) through to the transport in mail.data.
  const transporter = kind === 'smtp' ? nodemailer.createTransport(smtpUrl!) : nodemailer.createTransport(createOutboxTransport(db));
  return { sendMail: (message) => transporter.sendMail(message as Parameters<typeof transporter.sendMail>[0]) };
}
