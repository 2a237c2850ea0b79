import { mkdirSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../sim-server/db/seed-demo';
import { launchBrowser } from './chromium';
import { consoleProblems, signInAs } from './sign-in-as';

const ARTIFACTS = 'test-results';
const engineer = DEMO_ACCOUNTS.find((a) => a.email === 'rhea.engineer@demo.kinetwin.test')!;
const baseUrl = inject('baseUrl');

/** The first number in a text ("running t = 0.84 s" → 0.84); NaN when there is none. */
function firstNumber(text: string | null): number {
  return Number(/[-+]?\d+(\.\d+)?(e[-+]?\d+)?/i.exec(text ?? '')?.[0]);
}

async function statusText(page: Page): Promise<string> {
  return (await page.locator('[data-test=run-status]').textContent()) ?? '';
}

async function chartSamples(page: Page): Promise<number> {
  return Number(await page.locator('[data-test=angle-chart]').getAttribute('data-samples'));
}

/** A reading of the scrub readout by its key ("t", "angle", …), as a number. */
async function reading(page: Page, key: string): Promise<number> {
  return firstNumber(await page.locator(`[data-test=scrub-readout] [data-reading=${key}] dd`).textContent());
}

/** Moves the scrub slider: Playwright cannot fill a range input, so set it and raise its events. */
async function scrubTo(page: Page, time: number): Promise<void> {
  await page.locator('[data-test=scrub]').evaluate((input: HTMLInputElement, value) => {
    input.value = String(value);
    input.dispatchEvent(new Event('input', { bubbles: true }));
    input.dispatchEvent(new Event('change', { bubbles: true }));
  }, time);
}

/**
 * Every wait decides on what the page shows; these time-outs are guards for a busy machine (the
 * software-rendered 3D view shares the page's thread), not speed targets.
 */
const SLOW = { timeout: 30_000 };

/** Two readings of the chart's sample count half a second apart, once they agree. */
async function settledSamples(page: Page): Promise<number> {
  let settled = -1;
  await expect
    .poll(async () => {
      const before = await chartSamples(page);
      await page.waitForTimeout(500);
      settled = await chartSamples(page);
      return settled === before;
    }, SLOW)
    .toBe(true);
  return settled;
}

describe('live-run controls in Chromium', () => {
  let browser: Awaited<ReturnType<typeof launchBrowser>>;
  beforeAll(async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    browser = await launchBrowser();
  });
  afterAll(() => browser?.close());

  it('pauses, scrubs back, resumes, takes a kick, and the closed form with the kick still matches the twin', { timeout: 180_000 }, async () => {
    const page = await browser.context.newPage();
    const problems = consoleProblems(page);
    await signInAs(page, baseUrl, engineer);
    await page.locator('[data-test=scenario-row]', { hasText: 'Gantry' }).locator('a[data-test=open-scenario]').click();
    await page.waitForURL('**/bench/*');
    // Software WebGL compiles the 3D view's shaders on the page's thread: let that finish first.
    await page.locator('[data-test=joint-view] canvas').waitFor(SLOW);
    await expect.poll(() => page.locator('[data-test=closed-form-latex] .katex').count(), SLOW).toBeGreaterThan(0);
    expect(await page.locator('[data-test=kick-torque-impulse]').isDisabled()).toBe(true);
    expect(await page.locator('[data-test=pause]').isDisabled()).toBe(true);

    // The slowest speed: the 3 s run lasts half a minute, so the pause lands inside it however
    // slowly a busy machine answers the clicks.
    await page.selectOption('[data-test=speed]', '0.1');
    await page.click('[data-test=run]');
    await expect.poll(() => statusText(page), SLOW).toMatch(/running/);
    await expect.poll(async () => firstNumber(await statusText(page)), SLOW).toBeGreaterThan(0.6);

    await page.click('[data-test=pause]');
    await expect.poll(() => statusText(page), SLOW).toMatch(/^paused t = \d+\.\d\d s$/);
    // Frames sent before the pause took effect may still be drawn: wait until the chart settles.
    const held = await settledSamples(page);
    const pausedAt = firstNumber(await statusText(page));
    expect(pausedAt).toBeGreaterThan(0.6);
    expect(pausedAt).toBeLessThan(3);
    // Paused means no new samples, however long it stays paused.
    await page.waitForTimeout(1000);
    expect(await chartSamples(page)).toBe(held);
    expect(await statusText(page)).toMatch(/paused/);

    await scrubTo(page, 0.5);
    await page.locator('[data-test=scrub-readout]').waitFor(SLOW);
    await expect.poll(() => reading(page, 't'), SLOW).toBeCloseTo(0.5, 2);
    const scrubbedAngle = await reading(page, 'angle');
    expect(Number.isFinite(scrubbedAngle)).toBe(true);
    // The joint shows the scrubbed sample (the readout rounds to four figures).
    await expect.poll(async () => Number(await page.locator('[data-test=joint-view]').getAttribute('data-angle')), SLOW).toBeCloseTo(scrubbedAngle, 3);
    expect(await page.locator('[data-test=scrub-readout]').textContent()).toMatch(/saturating\s*no/);
    expect(await chartSamples(page)).toBe(held);

    await page.click('[data-test=resume]');
    await expect.poll(() => statusText(page), SLOW).toMatch(/running/);
    await expect.poll(() => chartSamples(page), SLOW).toBeGreaterThan(held);

    await page.fill('input[name="kick.amplitude"]', '0.02');
    await page.click('[data-test=kick-torque-impulse]');
    await expect.poll(() => page.locator('[data-test=kick-list] li').count(), SLOW).toBe(1);
    const kickText = (await page.locator('[data-test=kick-list] li').textContent()) ?? '';
    expect(kickText).toContain('torque impulse 0.02 N·m·s at t =');
    const kickTime = Number(/at t = ([0-9.]+)/.exec(kickText)?.[1]);
    expect(kickTime).toBeGreaterThan(pausedAt);
    expect(kickTime).toBeLessThan(3);
    // A kick is not an edit of the scenario: the tuning form stays at its saved values.
    expect(await page.locator('[data-test=reset-edits]').isDisabled()).toBe(true);

    // The rest of the run at ×10: the speed changes the pacing, never the samples.
    await page.selectOption('[data-test=speed]', '10');
    await expect.poll(() => statusText(page), SLOW).toMatch(/finished/);
    expect(await page.locator('[data-test=kick-torque-impulse]').isDisabled()).toBe(true);
    // 3 s at 2 ms: every sample arrived despite the pause.
    expect(await chartSamples(page)).toBe(1501);
    const residual = (await page.locator('[data-test=residual]').textContent()) ?? '';
    const maxResidual = Number(/=\s*([-+0-9.eE]+)/.exec(residual)?.[1]);
    // With every effect off the twin is the linear model: the closed form of the scenario plus the
    // kick (superposition, time-shift rule) meets it to integration error.
    expect(maxResidual).toBeLessThan(1e-6);

    // After the run, scrubbing reads the bench's own samples.
    await scrubTo(page, 1.5);
    await expect.poll(() => reading(page, 't'), SLOW).toBeCloseTo(1.5, 2);
    await page.screenshot({ path: `${ARTIFACTS}/bench-live-controls.png`, fullPage: true });
    expect(problems).toEqual([]);
    await page.close();
  });
});
