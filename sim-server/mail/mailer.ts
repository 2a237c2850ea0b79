import type { Logger } from '../logging/logger';
import { headerText } from './header-text';
import type { MailContent } from './mail-templates';
import type { MailTransport } from './mail-transport';

/**
 * Sends a composed message; a failed send is logged and reported, never thrown at the caller.
 * The subject, which carries user text (names), goes out as one header line.
 */
export interface Mailer {
  send(to: string, content: MailContent, teamId: number | null): Promise<boolean>;
}

export function createMailer(transport: MailTransport, from: string, logger: Logger): Mailer {
  return {
    async send(to, content, teamId) {
      const subject = headerText(content.subject);
      try {
        await transport.sendMail({ from, to: headerText(to), subject, text: content.text, html: content.html, teamId });
        return true;
      } catch (err) {
        // The action that sent the mail has happened; losing the notice must not undo it.
        logger.error({ err, subject }, 'mail could not be sent');
        return false;
      }
    },
  };
}
