import { describe, expect, it } from 'vitest';
import { readConfig } from './config';

const base = { DATABASE_URL: 'postgres://kinetwin@127.0.0.1:54329/kinetwin' };

describe('readConfig: mail and link settings', () => {
  it('defaults to the outbox transport and links to the server itself', () => {
    const read = readConfig({ ...base, PORT: '4301' });
    expect(read).toMatchObject({ ok: true, config: { mailTransport: 'outbox', smtpUrl: null, appBaseUrl: 'http://127.0.0.1:4301', appBaseUrlConfigured: false, invitationTtlHours: 72, passwordResetTtlMinutes: 60 } });
  });

  it('keeps only the origin of APP_BASE_URL', () => {
    expect(readConfig({ ...base, APP_BASE_URL: 'https://kinetwin.example.test/some/path/' })).toMatchObject({ ok: true, config: { appBaseUrl: 'https://kinetwin.example.test', appBaseUrlConfigured: true } });
  });

  it.each([
    [{ MAIL_TRANSPORT: 'smtp' }, 'SMTP_URL is required when MAIL_TRANSPORT=smtp'],
    [{ MAIL_TRANSPORT: 'pigeon' }, 'MAIL_TRANSPORT must be outbox or smtp'],
    [{ SMTP_URL: 'http://mail.example.test' }, 'SMTP_URL must start with smtp:// or smtps://'],
    [{ APP_BASE_URL: 'ftp://files.example.test' }, 'APP_BASE_URL must be an http:// or https:// address'],
    [{ KINETWIN_MODE: 'production', SESSION_SECRET: 'a-long-enough-secret' }, 'APP_BASE_URL is required when KINETWIN_MODE=production'],
    [{ INVITATION_TTL_HOURS: '0' }, '"INVITATION_TTL_HOURS"'],
  ])('refuses %o in one line naming the setting', (env, message) => {
    const read = readConfig({ ...base, ...env });
    expect(read.ok).toBe(false);
    if (!read.ok) expect(read.message).toContain(message);
  });

  it('configures SMTP from MAIL_TRANSPORT and SMTP_URL', () => {
    const read = readConfig({ ...base, MAIL_TRANSPORT: 'smtp', SMTP_URL: 'smtp://mail.example.test:587' });
    expect(read).toMatchObject({ ok: true, config: { mailTransport: 'smtp', smtpUrl: 'smtp://mail.example.test:587' } });
  });
});
