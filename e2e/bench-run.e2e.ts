import { mkdirSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../sim-server/db/seed-demo';
import { launchBrowser } from './chromium';

const ARTIFACTS = 'test-results';
const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;
const baseUrl = inject('baseUrl');

/** Console errors and CSP violations the page reported; any of them fails the test. */
function watchConsole(page: Page): string[] {
  const problems: string[] = [];
  page.on('console', (msg) => {
    if (msg.type() === 'error') problems.push(msg.text());
  });
  page.on('pageerror', (err) => problems.push(err.message));
  return problems;
}

async function signInAsEngineer(page: Page) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.fill('input[name=email]', engineer.email);
  await page.fill('input[name=password]', engineer.password);
  await page.click('[data-test=sign-in]');
  await page.waitForURL('**/library');
}

/** Reads the WebGL canvas back through a 2D canvas and measures how much of it is not background. */
function canvasCoverage(page: Page) {
  return page.evaluate(() => {
    const canvas = document.querySelector<HTMLCanvasElement>('[data-test=joint-view] canvas');
    if (!canvas) return { width: 0, height: 0, colours: 0, covered: 0 };
    const copy = document.createElement('canvas');
    copy.width = canvas.width;
    copy.height = canvas.height;
    const ctx = copy.getContext('2d')!;
    ctx.drawImage(canvas, 0, 0);
    const { data } = ctx.getImageData(0, 0, copy.width, copy.height);
    const colours = new Set<number>();
    const background = (data[0]! << 16) | (data[1]! << 8) | data[2]!;
    let covered = 0;
    for (let i = 0; i < data.length; i += 4) {
      const rgb = (data[i]! << 16) | (data[i + 1]! << 8) | data[i + 2]!;
      colours.add(rgb >> 3);
      if (rgb !== background) covered++;
    }
    return { width: copy.width, height: copy.height, colours: colours.size, covered: covered / (data.length / 4) };
  });
}

describe('bench in Chromium', () => {
  let browser: Awaited<ReturnType<typeof launchBrowser>>;
  beforeAll(async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    browser = await launchBrowser();
  });
  afterAll(() => browser?.close());

  it('refuses a wrong password with a message and shows the demo sign-ins', async () => {
    const page = await browser.context.newPage();
    await page.goto(`${baseUrl}/library`);
    await page.waitForURL(/\/sign-in/);
    await expect.poll(() => page.locator('[data-test=demo-accounts]').textContent()).toContain(engineer.email);
    await page.fill('input[name=email]', engineer.email);
    await page.fill('input[name=password]', 'not-the-password');
    await page.click('[data-test=sign-in]');
    await expect.poll(() => page.locator('[data-test=sign-in-error]').textContent()).toContain('Email or password is incorrect.');
    await page.close();
  });

  it('signs in, opens a demo scenario, runs it, and draws the chart and the joint', async () => {
    const page = await browser.context.newPage();
    const problems = watchConsole(page);
    await signInAsEngineer(page);
    const row = page.locator('[data-test=scenario-row]', { hasText: 'Wrist pitch' });
    await row.locator('a[data-test=open-scenario]').click();
    await page.waitForURL('**/bench/*');
    await expect.poll(() => page.locator('[data-test=bench-title]').textContent()).toContain('Wrist pitch');
    await page.locator('[data-test=joint-view] canvas').waitFor({ timeout: 20_000 });

    await page.click('[data-test=run]');
    await expect.poll(() => page.locator('[data-test=run-status]').textContent(), { timeout: 20_000 }).toMatch(/finished/i);

    const samples = Number(await page.locator('[data-test=angle-chart]').getAttribute('data-samples'));
    // The wrist scenario runs 2 s at the default 2 ms spacing: 1001 samples.
    expect(samples).toBe(1001);
    const angle = Number(await page.locator('[data-test=joint-view]').getAttribute('data-angle'));
    expect(angle).toBeGreaterThan(0.4);
    expect(angle).toBeLessThan(0.6);
    await expect.poll(() => page.locator('[data-test=angle-chart] .plot-container').count()).toBe(1);

    // The closed form of the same scenario sits beside the twin and agrees with it.
    await expect.poll(() => page.locator('[data-test=closed-form-latex] .katex').count()).toBeGreaterThan(0);
    expect(await page.locator('[data-test=final-value]').textContent()).toMatch(/0\.5/);
    expect(Number(await page.locator('[data-test=angle-chart]').getAttribute('data-closed-form-samples'))).toBeGreaterThan(100);
    const residual = (await page.locator('[data-test=residual]').textContent()) ?? '';
    const maxResidual = Number(/=\s*([-+0-9.eE]+)/.exec(residual)?.[1]);
    // With every effect off the twin is the linear model: agreement to integration error.
    expect(maxResidual).toBeLessThan(1e-6);

    const view = await canvasCoverage(page);
    expect(view.width).toBeGreaterThan(100);
    expect(view.colours).toBeGreaterThan(8);
    expect(view.covered).toBeGreaterThan(0.02);
    await page.screenshot({ path: `${ARTIFACTS}/bench-after-run.png`, fullPage: true });
    expect(problems).toEqual([]);
    await page.close();
  });

  it('reruns an edited gain inline and redraws the closed form', async () => {
    const page = await browser.context.newPage();
    await signInAsEngineer(page);
    await page.locator('[data-test=scenario-row]', { hasText: 'Wrist pitch' }).locator('a[data-test=open-scenario]').click();
    // Software WebGL compiles the 3D view's shaders on the page's thread: let that finish first.
    await page.locator('[data-test=joint-view] canvas').waitFor({ timeout: 20_000 });
    const slow = { timeout: 10_000 };
    await expect.poll(() => page.locator('[data-test=metric-overshootPercent]').textContent(), slow).toMatch(/\d/);
    const before = await page.locator('[data-test=metric-overshootPercent]').textContent();
    // Less derivative gain: a more lightly damped loop, so more overshoot.
    await page.fill('input[name="controller.kd"]', '0.15');
    await expect.poll(() => page.locator('[data-test=metric-overshootPercent]').textContent(), slow).not.toBe(before);
    await page.fill('input[name="joint.inertia"]', '-1');
    await expect.poll(() => page.locator('[data-test=run]').isEnabled(), slow).toBe(false);
    await page.fill('input[name="joint.inertia"]', '0.012');
    await page.click('[data-test=run]');
    await expect.poll(() => page.locator('[data-test=run-status]').textContent(), { timeout: 20_000 }).toMatch(/finished/i);
    expect(await page.locator('[data-test=residual]').textContent()).toContain('edited scenario');
    await page.screenshot({ path: `${ARTIFACTS}/bench-edited-gain.png`, fullPage: true });
    await page.close();
  });

  it('stops a run on request', async () => {
    const page = await browser.context.newPage();
    await signInAsEngineer(page);
    await page.locator('[data-test=scenario-row]', { hasText: 'Elbow on its spring' }).locator('a[data-test=open-scenario]').click();
    // Software WebGL compiles the 3D view's shaders on the page's thread: let that finish first.
    await page.locator('[data-test=joint-view] canvas').waitFor({ timeout: 20_000 });
    await page.click('[data-test=run]');
    await expect.poll(() => page.locator('[data-test=run-status]').textContent()).toMatch(/running/i);
    await page.click('[data-test=stop]');
    await expect.poll(() => page.locator('[data-test=run-status]').textContent()).toMatch(/stopped/i);
    const samples = Number(await page.locator('[data-test=angle-chart]').getAttribute('data-samples'));
    expect(samples).toBeGreaterThan(0);
    // The elbow scenario runs 4 s; stopped early, it holds fewer samples than a full run.
    expect(samples).toBeLessThan(2001);
    await page.close();
  });
});

describe('bench without WebGL', () => {
  it('says the 3D view is unavailable and still charts the run', async () => {
    const browser = await launchBrowser({ withoutWebGL: true });
    try {
      const page = await browser.context.newPage();
      await signInAsEngineer(page);
      await page.locator('[data-test=scenario-row]', { hasText: 'Wrist pitch' }).locator('a[data-test=open-scenario]').click();
      await expect.poll(() => page.locator('[data-test=webgl-missing]').textContent(), { timeout: 20_000 }).toContain('3D view unavailable');
      await page.click('[data-test=run]');
      await expect.poll(() => page.locator('[data-test=run-status]').textContent(), { timeout: 20_000 }).toMatch(/finished/i);
      expect(Number(await page.locator('[data-test=angle-chart]').getAttribute('data-samples'))).toBe(1001);
      await page.screenshot({ path: `${ARTIFACTS}/bench-without-webgl.png`, fullPage: true });
    } finally {
      await browser.close();
    }
  });
});
