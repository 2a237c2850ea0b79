import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';

/** Debian's Chromium; npm test installs it with apt when it is missing. */
export const CHROMIUM_PATH = process.env['CHROMIUM_PATH'] ?? '/usr/bin/chromium';

// Headless with software WebGL (SwiftShader), and none of Chromium's calls home: this machine
// has no network beyond loopback, and each refused connection would slow the browser down.
const FLAGS = [
  '--headless=new',
  '--no-sandbox',
  '--disable-gpu',
  '--use-angle=swiftshader',
  '--enable-unsafe-swiftshader',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--disable-dev-shm-usage',
];

/** A fresh browser profile; `withoutWebGL` starts Chromium with its 3D APIs switched off. */
export async function launchBrowser(options: { withoutWebGL?: boolean } = {}): Promise<{ context: BrowserContext; close(): Promise<void> }> {
  if (!existsSync(CHROMIUM_PATH)) throw new Error(`Chromium not found at ${CHROMIUM_PATH}; run npm test (it installs Debian's chromium) or set CHROMIUM_PATH`);
  const profile = mkdtempSync(path.join(tmpdir(), 'kinetwin-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: [...FLAGS, ...(options.withoutWebGL ? ['--disable-3d-apis', '--disable-webgl'] : [])],
    viewport: { width: 1280, height: 860 },
  });
  return {
    context,
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}
