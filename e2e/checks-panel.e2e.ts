import { mkdirSync, readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../sim-server/db/seed-demo';
import { launchBrowser } from './chromium';
import { consoleProblems, signInAs } from './sign-in-as';

const ARTIFACTS = 'test-results';
const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;
const baseUrl = inject('baseUrl');
/** The checks run on the server in a worker; the first one also starts that worker. */
const CHECKS = { timeout: 30_000 };

const text = async (page: Page, selector: string) => ((await page.locator(selector).textContent()) ?? '').replace(/\s+/g, ' ').trim();

/**
 * A mutating API call as the signed-in page makes it: the session cookie rides along and the
 * XSRF-TOKEN cookie is echoed, as Angular's HttpClient does. Returns the status and JSON body.
 */
async function apiCall(page: Page, path: string, body: unknown): Promise<{ status: number; body: { id?: number } }> {
  return page.evaluate(
    async ({ path, body }) => {
      const token = /(?:^|; )XSRF-TOKEN=([^;]+)/.exec(document.cookie)?.[1] ?? '';
      const res = await fetch(path, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-xsrf-token': decodeURIComponent(token) },
        body: JSON.stringify(body),
      });
      return { status: res.status, body: (await res.json()) as { id?: number } };
    },
    { path, body },
  );
}

describe('checks panel in Chromium', () => {
  let browser: Awaited<ReturnType<typeof launchBrowser>>;
  beforeAll(async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    browser = await launchBrowser();
  });
  afterAll(() => browser?.close());

  it('runs the checks of a linear demo: both pass, the whole range holds, and an edit marks them stale', async () => {
    const page = await browser.context.newPage();
    const problems = consoleProblems(page);
    await signInAs(page, baseUrl, engineer);
    await page.locator('[data-test=scenario-row]', { hasText: 'Wrist pitch' }).locator('a[data-test=open-scenario]').click();
    await page.waitForURL('**/bench/*');
    await page.locator('[data-test=joint-view] canvas').waitFor({ timeout: 20_000 });

    await page.click('[data-test=run-checks]');
    await expect.poll(() => text(page, '[data-test=check-superposition] [data-test=verdict]'), CHECKS).toBe('passes');
    expect(await text(page, '[data-test=check-shift] [data-test=verdict]')).toBe('passes');
    expect(await text(page, '[data-test=check-superposition] [data-test=reason]')).toMatch(/^superposition holds/);
    expect(await text(page, '[data-test=linear-range]')).toBe('The closed form holds up to at least ×1000 of this input (the largest scale tried), and down to ×0.001.');
    expect(await text(page, '[data-test=residual-figures]')).toMatch(/^RMS [0-9.e-]+ rad, max [0-9.e-]+ rad at t = [0-9.]+ s\.$/);
    expect(await page.locator('[data-test=checks-stale]').count()).toBe(0);
    await page.screenshot({ path: `${ARTIFACTS}/checks-linear-demo.png`, fullPage: true });

    // Another gain is another draft: the results stay, marked stale.
    await page.fill('input[name="controller.kd"]', '0.15');
    await expect.poll(() => page.locator('[data-test=checks-stale]').count()).toBe(1);
    expect(await text(page, '[data-test=check-superposition] [data-test=verdict]')).toBe('passes');
    expect(problems).toEqual([]);
    await page.close();
  });

  it('fails the superposition check of the wrist behind a torque limit, naming the limit', async () => {
    const page = await browser.context.newPage();
    const problems = consoleProblems(page);
    await signInAs(page, baseUrl, engineer);
    // Demo data (invented numbers): the wrist demo behind a 1 N·m drive limit, under a name the
    // other browser tests' row look-ups ("Wrist pitch") do not match; archived at the end.
    const wrist = JSON.parse(readFileSync(new URL('../scenarios/wrist-pitch-step.json', import.meta.url), 'utf8')) as Record<string, unknown>;
    const created = await apiCall(page, '/api/scenarios', {
      scenario: { ...wrist, name: `Checks test: wrist behind a 1 N·m limit ${Date.now()}`, nonlinear: { torqueLimit: 1 } },
      note: 'Made by the checks-panel browser test',
    });
    expect(created.status).toBe(201);
    const id = created.body.id!;
    await page.goto(`${baseUrl}/bench/${id}`);
    await expect.poll(() => text(page, '[data-test=bench-title]')).toContain('behind a 1 N·m limit');
    await page.locator('[data-test=joint-view] canvas').waitFor({ timeout: 20_000 });

    await page.click('[data-test=run-checks]');
    await expect.poll(() => text(page, '[data-test=check-superposition] [data-test=verdict]'), CHECKS).toBe('fails');
    expect(await text(page, '[data-test=check-superposition] [data-test=reason]')).toMatch(/^torque limit ±1 N·m reached at t = 0\.100 s/);
    expect(await text(page, '[data-test=check-superposition]')).toMatch(/worst deviation [0-9.]+ % of the peak angle; passes up to 0\.01 %/);
    // Delaying the input delays the saturation with it: the shift check still passes.
    expect(await text(page, '[data-test=check-shift] [data-test=verdict]')).toBe('passes');
    expect(await text(page, '[data-test=linear-range]')).toBe('The closed form holds up to ×0.17 of this input. This input (×1) is past it: expect the twin to depart from the closed form.');
    await page.screenshot({ path: `${ARTIFACTS}/checks-torque-limited.png`, fullPage: true });
    expect(problems).toEqual([]);
    expect((await apiCall(page, `/api/scenarios/${id}/archive`, {})).status).toBe(200);
    await page.close();
  });
});
