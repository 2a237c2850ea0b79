import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../testing/test-server';

/** A built app stand-in: the shell and one large chunk, as `ng build` leaves them. */
const chunk = `export const table = [${Array.from({ length: 20_000 }, (_, i) => i % 97).join(',')}];\n`;

describe('the served app', () => {
  let t: TestServer;
  let dir: string;

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'kinetwin-static-'));
    writeFileSync(path.join(dir, 'index.html'), '<!doctype html><title>Kinetwin</title><script src="main.js"></script>');
    writeFileSync(path.join(dir, 'main.js'), chunk);
    t = await startTestServer({ STATIC_DIR: dir });
  });
  afterAll(async () => {
    await t?.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('sends its scripts gzip-compressed to a browser that accepts it, the same bytes once unpacked', async () => {
    const res = await fetch(`${t.baseUrl}/main.js`, { headers: { 'accept-encoding': 'gzip' } });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-encoding')).toBe('gzip');
    expect(await res.text()).toBe(chunk);
  });

  it('sends them plain to a client that does not ask for compression', async () => {
    const res = await fetch(`${t.baseUrl}/main.js`, { headers: { 'accept-encoding': 'identity' } });
    expect(res.headers.get('content-encoding')).toBeNull();
    expect(await res.text()).toBe(chunk);
  });

  it('sends far fewer bytes compressed than the file holds', async () => {
    const { request } = await import('node:http');
    const body = await new Promise<Buffer>((resolve, reject) => {
      request(`${t.baseUrl}/main.js`, { headers: { 'accept-encoding': 'gzip' } }, (res) => {
        const parts: Buffer[] = [];
        res.on('data', (b: Buffer) => parts.push(b));
        res.on('end', () => resolve(Buffer.concat(parts)));
        res.on('error', reject);
      })
        .on('error', reject)
        .end();
    });
    expect(gunzipSync(body).toString()).toBe(chunk);
    expect(body.length).toBeLessThan(Buffer.byteLength(chunk) / 3);
  });

  it('serves client-side routes the app shell', async () => {
    const res = await fetch(`${t.baseUrl}/library`);
    expect(res.status).toBe(200);
    expect(await res.text()).toContain('<title>Kinetwin</title>');
  });
});
