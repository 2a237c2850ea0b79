import { mkdirSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { linearizeAbout } from '../shared/linearize/operating-point';
import { operatingRange } from '../shared/linearize/operating-range';
import { SAFETY_CAUTION } from '../shared/protocol/library-api';
import { parseScenario } from '../shared/scenario/parse-scenario';
import { DEMO_ACCOUNTS } from '../sim-server/db/seed-demo';
import { launchBrowser } from './chromium';
import { consoleProblems, signInAs } from './sign-in-as';

const ARTIFACTS = 'test-results';
const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;
const baseUrl = inject('baseUrl');
const PANEL = '[data-test=linearize-panel]';
/** The operating range is a bisection of twin runs in a worker on the server. */
const RANGE = { timeout: 60_000 };

const text = async (page: Page, selector: string) => ((await page.locator(selector).first().textContent()) ?? '').replace(/\s+/g, ' ').trim();
const fourFigures = (x: number) => String(Number(x.toPrecision(4)));

/** A mutating API call as the signed-in page makes it (session cookie, XSRF token echoed). */
async function apiCall(page: Page, path: string, body: unknown): Promise<{ status: number; body: { id?: number } }> {
  return page.evaluate(
    async ({ path, body }) => {
      const token = /(?:^|; )XSRF-TOKEN=([^;]+)/.exec(document.cookie)?.[1] ?? '';
      const res = await fetch(path, { method: 'POST', headers: { 'content-type': 'application/json', 'x-xsrf-token': decodeURIComponent(token) }, body: JSON.stringify(body) });
      return { status: res.status, body: (await res.json()) as { id?: number } };
    },
    { path, body },
  );
}

// Demo data (invented numbers): a 1.2 kg link with its centre of mass 0.25 m out, hanging straight
// down at θ = 0 on a 0.5 N·m/rad spring, under PID, commanded through 0.1 rad.
const arm = {
  kind: 'kinetwin/scenario',
  version: 1,
  notes: 'DEMO DATA (invented numbers). Made by the linearize-panel browser test.',
  joint: { inertia: 0.09, damping: 0.2, stiffness: 0.5, gearRatio: 1 },
  controller: { mode: 'pid', kp: 20, ki: 2, kd: 1.5, derivativeOn: 'measurement', derivativeFilter: 0, samplePeriod: null },
  initial: { angle: 0, velocity: 0 },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.1, delay: 0.1 }],
  horizon: 3,
  nonlinear: { gravity: { mass: 1.2, arm: 0.25 } },
};
const mgl = 1.2 * 9.80665 * 0.25;

describe('linear model about a pose in Chromium', () => {
  let browser: Awaited<ReturnType<typeof launchBrowser>>;
  beforeAll(async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    browser = await launchBrowser();
  });
  afterAll(() => browser?.close());

  it('is not offered for a joint without gravity', async () => {
    const page = await browser.context.newPage();
    await signInAs(page, baseUrl, engineer);
    await page.locator('[data-test=scenario-row]', { hasText: 'Wrist pitch' }).locator('a[data-test=open-scenario]').click();
    await page.waitForURL('**/bench/*');
    await page.locator('[data-test=frequency-panel]').waitFor();
    expect(await page.locator(PANEL).isVisible()).toBe(false);
    expect(await page.locator(`${PANEL} h2`).count()).toBe(0);
    await page.close();
  });

  it('linearizes a gravity-loaded arm at 60°, finds how far the model holds, and saves it to the library', async () => {
    const page = await browser.context.newPage();
    const problems = consoleProblems(page);
    await signInAs(page, baseUrl, engineer);
    const name = `Linearize test: arm ${Date.now()}`;
    const created = await apiCall(page, '/api/scenarios', { scenario: { ...arm, name }, note: 'Made by the linearize-panel browser test' });
    expect(created.status).toBe(201);
    const id = created.body.id!;
    await page.goto(`${baseUrl}/bench/${id}`);
    await expect.poll(() => text(page, '[data-test=bench-title]')).toBe(name);
    await page.locator(`${PANEL} h2`).waitFor();

    await page.fill('input[name="linearize-angle"]', '60');
    // k + m·g·l·cos 60°, shown the moment the angle is typed (pendulum linearization; common practice).
    await expect.poll(() => text(page, `${PANEL} [data-test=effective-stiffness]`)).toBe(`${fourFigures(0.5 + mgl * Math.cos(Math.PI / 3))} N·m/rad`);
    expect(await text(page, `${PANEL} [data-test=holding-torque]`)).toBe(`${fourFigures(0.5 * (Math.PI / 3) + mgl * Math.sin(Math.PI / 3))} N·m`);
    expect(await page.locator(`${PANEL} [data-test=linearize-caution]`).count()).toBe(0);

    // The same linearization and range, computed here from shared/, is what the panel must show.
    const parsed = parseScenario({ ...arm, name });
    if (!parsed.ok) throw new Error('fixture invalid');
    const pair = linearizeAbout(parsed.value, { angle: (60 * Math.PI) / 180, holding: 'feed-forward' });
    if (!pair.ok) throw new Error('refused');
    const range = operatingRange(pair.value, { tolerance: 0.01 });
    if (!range.ok || range.value.largestMove === null) throw new Error('no range');
    expect(await page.locator(`${PANEL} [data-test=linearize-notes] li`).allTextContents()).toEqual(pair.value.notes.map((n) => ` ${n} `.trim()));

    await page.click(`${PANEL} [data-test=find-range]`);
    await expect.poll(() => page.locator(`${PANEL} [data-test=range-running]`).count()).toBe(1);
    await expect.poll(() => text(page, `${PANEL} [data-test=range-summary]`), RANGE).toBe(range.value.summary);
    expect(await text(page, `${PANEL} [data-test=range-headline]`)).toMatch(new RegExp(`^The linear model holds within 1 % of the peak for moves up to ${fourFigures(range.value.largestMove).replace('.', '\\.')} rad \\(`));
    expect(await page.locator(`${PANEL} [data-test=range-stale]`).count()).toBe(0);
    await page.locator(PANEL).screenshot({ path: `${ARTIFACTS}/linearize-panel-60deg.png` });

    // Another angle is another question: the range stays, marked stale.
    await page.fill('input[name="linearize-angle"]', '45');
    await expect.poll(() => page.locator(`${PANEL} [data-test=range-stale]`).count()).toBe(1);
    await page.fill('input[name="linearize-angle"]', '60');
    await expect.poll(() => page.locator(`${PANEL} [data-test=range-stale]`).count()).toBe(0);

    await page.click(`${PANEL} [data-test=save-linear]`);
    await expect.poll(() => text(page, `${PANEL} [data-test=linear-saved]`)).toContain(`Saved “${pair.value.linear.name}” to the library as a new scenario.`);
    expect(await text(page, `${PANEL} [data-test=safety-caution]`)).toContain(SAFETY_CAUTION);
    const linearId = (await page.locator(`${PANEL} [data-test=open-linear]`).getAttribute('href'))!.split('/').at(-1)!;
    const stored = await page.evaluate(async (path) => ((await (await fetch(path)).json()) as { scenario: unknown }).scenario, `/api/scenarios/${linearId}`);
    expect(stored).toEqual(JSON.parse(JSON.stringify(pair.value.linear)));

    await page.goto(`${baseUrl}/library`);
    await page.fill('[data-test=library-search]', name);
    // The search leaves the arm and its linear model (whose name starts with the arm's).
    await expect.poll(() => page.locator('[data-test=scenario-row]').count()).toBe(2);
    expect(await page.locator('[data-test=scenario-row]', { hasText: pair.value.linear.name }).count()).toBe(1);
    await page.screenshot({ path: `${ARTIFACTS}/linearize-saved-in-library.png`, fullPage: true });

    // The saved model opens on the bench with no gravity left, so nothing to linearize.
    await page.locator('[data-test=scenario-row]', { hasText: pair.value.linear.name }).locator('a[data-test=open-scenario]').click();
    await expect.poll(() => text(page, '[data-test=bench-title]')).toBe(pair.value.linear.name);
    await page.locator('[data-test=frequency-panel]').waitFor();
    expect(await page.locator(`${PANEL} h2`).count()).toBe(0);

    expect(problems).toEqual([]);
    expect((await apiCall(page, `/api/scenarios/${linearId}/archive`, {})).status).toBe(200);
    expect((await apiCall(page, `/api/scenarios/${id}/archive`, {})).status).toBe(200);
    await page.close();
  });
});
