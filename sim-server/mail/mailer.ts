import type { Logger } from '../logging/logger';
import type { MailContent } from './mail-templates';
import type { MailTransport } from './mail-transport';

/** Sends a composed message; a failed send is logged and reported, never thrown at the caller. */
export interface Mailer {
  send(to: string, content: MailContent, teamId: number | null): Promise<boolean>;
}

export function createMailer(transport: MailTransport, from: string, logger: Logger): Mailer {
  return {
    async send(to, content, teamId) {
      try {
        await transport.sendMail({ from, to, subject: content.subject, text: content.text, html: content.html, teamId });
        return true;
      } catch (err) {
        // The action that sent the mail has happened; losing the notice must not undo it.
        logger.error({ err, subject: content.subject }, 'mail could not be sent');
        return false;
      }
    },
  };
}
