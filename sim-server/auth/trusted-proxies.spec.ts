import { describe, expect, it } from 'vitest';
import { readConfig } from '../config';
import { parseTrustedProxies } from './trusted-proxies';

describe('parseTrustedProxies (TRUST_PROXY)', () => {
  it.each([
    [undefined, false],
    ['', false],
    ['  false ', false],
    ['10.0.0.5', ['10.0.0.5']],
    ['10.0.0.5, 10.0.0.0/8,fd00::/8 , ::1, loopback, uniquelocal', ['10.0.0.5', '10.0.0.0/8', 'fd00::/8', '::1', 'loopback', 'uniquelocal']],
    ['192.168.0.0/255.255.0.0', ['192.168.0.0/255.255.0.0']],
  ])('reads %o as %o', (text, value) => {
    expect(parseTrustedProxies(text)).toEqual({ ok: true, value });
  });

  it.each([
    ['true', /would believe X-Forwarded-For from any client/],
    ['2', /would believe X-Forwarded-For from any client/],
    ['10.0.0.300', /"10.0.0.300" is not an address/],
    ['10.0.0.0/33', /"10.0.0.0\/33" is not an address/],
    ['fd00::/129', /"fd00::\/129"/],
    ['fd00::/ffff::', /"fd00::\/ffff::"/],
    ['10.0.0.1,', /"" is not an address/],
    ['proxy.internal', /"proxy.internal" is not an address/],
  ])('refuses %o', (text, message) => {
    const parsed = parseTrustedProxies(text);
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.message).toMatch(message);
  });

  it('is off by default in the configuration and refused at start-up in one line', () => {
    const base = { DATABASE_URL: 'postgres://kinetwin@127.0.0.1:54329/kinetwin' };
    expect(readConfig(base)).toMatchObject({ ok: true, config: { trustProxy: false } });
    expect(readConfig({ ...base, TRUST_PROXY: '10.1.2.3' })).toMatchObject({ ok: true, config: { trustProxy: ['10.1.2.3'] } });
    const bad = readConfig({ ...base, TRUST_PROXY: 'true' });
    expect(bad).toMatchObject({ ok: false, message: expect.stringMatching(/^configuration: TRUST_PROXY must name the proxies/) });
  });
});
