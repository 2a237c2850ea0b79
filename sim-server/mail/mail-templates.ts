import { SAFETY_CAUTION } from '../../shared/protocol/library-api';

/** A message body in both forms every client can show; the HTML has no external images or styles. */
export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

/** Escapes text for HTML element content and attribute values. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

interface Block {
  /** Paragraph text; newlines are kept. */
  paragraph?: string;
  /** Quoted user text (a message or comment). */
  quote?: string;
  link?: { label: string; url: string };
  caution?: true;
}

function compose(subject: string, blocks: Block[]): MailContent {
  const text: string[] = [];
  const html: string[] = [];
  for (const b of blocks) {
    if (b.paragraph !== undefined) {
      text.push(b.paragraph);
      html.push(`<p>${escapeHtml(b.paragraph).replace(/\n/g, '<br>')}</p>`);
    }
    if (b.quote) {
      text.push(b.quote.split('\n').map((line) => `> ${line}`).join('\n'));
      html.push(`<blockquote style="border-left:3px solid #999;margin:0;padding-left:12px">${escapeHtml(b.quote).replace(/\n/g, '<br>')}</blockquote>`);
    }
    if (b.link) {
      text.push(`${b.link.label}: ${b.link.url}`);
      html.push(`<p><a href="${escapeHtml(b.link.url)}">${escapeHtml(b.link.label)}</a></p>`);
    }
    if (b.caution) {
      text.push(`Safety: ${SAFETY_CAUTION}`);
      html.push(`<p><strong>Safety:</strong> ${escapeHtml(SAFETY_CAUTION)}</p>`);
    }
  }
  text.push('— Kinetwin');
  html.push('<p style="color:#666">— Kinetwin</p>');
  return {
    subject,
    text: text.join('\n\n') + '\n',
    html: `<!doctype html><html><body style="font-family:sans-serif">${html.join('\n')}</body></html>`,
  };
}

export function invitationMail(p: { inviter: string; teamName: string; role: string; url: string; expiresAt: Date }): MailContent {
  return compose(`${p.inviter} invited you to ${p.teamName} on Kinetwin`, [
    { paragraph: `${p.inviter} invited you to join the team "${p.teamName}" on Kinetwin as ${p.role}.` },
    { link: { label: 'Accept the invitation', url: p.url } },
    { paragraph: `The link works once and until ${p.expiresAt.toUTCString()}. If you did not expect it, ignore this message.` },
  ]);
}

export function passwordResetMail(p: { displayName: string; url: string; expiresAt: Date }): MailContent {
  return compose('Reset your Kinetwin password', [
    { paragraph: `Hello ${p.displayName}, someone asked to reset the password of your Kinetwin account.` },
    { link: { label: 'Choose a new password', url: p.url } },
    { paragraph: `The link works once and until ${p.expiresAt.toUTCString()}. Setting a new password signs you out everywhere. If you did not ask for this, ignore this message; your password stays as it is.` },
  ]);
}

export function handoffMail(p: { from: string; scenarioName: string; access: 'view' | 'edit'; message: string; url: string }): MailContent {
  return compose(`${p.from} handed you "${p.scenarioName}"`, [
    { paragraph: `${p.from} handed you the scenario "${p.scenarioName}" to ${p.access === 'edit' ? 'view and edit' : 'view'}.` },
    ...(p.message ? [{ quote: p.message }] : []),
    { link: { label: 'Open the scenario', url: p.url } },
  ]);
}

export function mentionMail(p: { author: string; scenarioName: string; revision: number; body: string; url: string }): MailContent {
  return compose(`${p.author} mentioned you on "${p.scenarioName}"`, [
    { paragraph: `${p.author} mentioned you in a comment on revision ${p.revision} of "${p.scenarioName}".` },
    { quote: p.body },
    { link: { label: 'Open the comments', url: p.url } },
  ]);
}

export function signOffMail(p: { lead: string; scenarioName: string; revision: number; note: string; url: string }): MailContent {
  return compose(`"${p.scenarioName}" revision ${p.revision} is signed off`, [
    { paragraph: `${p.lead} signed off revision ${p.revision} of "${p.scenarioName}". That revision can no longer change; later saves start a new revision that is not signed off.` },
    ...(p.note ? [{ quote: p.note }] : []),
    { link: { label: 'Open the scenario', url: p.url } },
    { caution: true },
  ]);
}
