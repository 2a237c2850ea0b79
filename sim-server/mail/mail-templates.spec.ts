import { describe, expect, it } from 'vitest';
import { SAFETY_CAUTION } from '../../shared/protocol/library-api';
import { escapeHtml, handoffMail, invitationMail, mentionMail, passwordResetMail, signOffMail } from './mail-templates';

const url = 'http://127.0.0.1:4300/library/7';

describe('mail templates', () => {
  const all = [
    invitationMail({ inviter: 'Ada', teamName: 'Lab <1>', role: 'lead', url, expiresAt: new Date('2026-12-05T10:00:00Z') }),
    passwordResetMail({ displayName: 'Ada', url, expiresAt: new Date('2026-12-05T10:00:00Z') }),
    handoffMail({ from: 'Ada', scenarioName: 'Wrist "fast"', access: 'edit', message: '<script>alert(1)</script>\nsecond line', url }),
    mentionMail({ author: 'Bo', scenarioName: 'Elbow', revision: 3, body: 'see @ana@lab.test & me', url }),
    signOffMail({ lead: 'Tomas', scenarioName: 'Elbow', revision: 3, note: '', url }),
  ];

  it('writes every message as plain text and self-contained HTML with the link in both', () => {
    for (const mail of all) {
      expect(mail.text).toContain(url);
      expect(mail.html).toContain(`href="${url}"`);
      expect(mail.html).toMatch(/^<!doctype html>/);
      // No images, stylesheets or scripts from anywhere: the only address is the app's link.
      expect(mail.html).not.toMatch(/<img|<link|<script|url\(/i);
      expect(mail.html.match(/https?:\/\/[^"<\s]+/g)?.every((u) => u === url)).toBe(true);
    }
  });

  it('escapes user text in HTML and quotes it in plain text', () => {
    const handoff = all[2]!;
    expect(handoff.html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;<br>second line');
    expect(handoff.text).toContain('> <script>alert(1)</script>\n> second line');
    expect(all[0]!.html).toContain('Lab &lt;1&gt;');
    expect(escapeHtml(`a&b<c>"d"'e'`)).toBe('a&amp;b&lt;c&gt;&quot;d&quot;&#39;e&#39;');
  });

  it('carries the safety caution on a sign-off notice', () => {
    expect(all[4]!.text).toContain(SAFETY_CAUTION);
    expect(all[4]!.subject).toBe('"Elbow" revision 3 is signed off');
  });
});
