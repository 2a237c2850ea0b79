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

describe('live-run controls in Chromium', () => {
  let browser: Awaited<ReturnType<typeof launchBrowser>>;
  beforeAll(async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    browser = await launchBrowser();
  });
  afterAll(() => browser?.close());

  it('pauses, scrubs back, resumes, takes a kick, and the closed form with the kick still matches the twin', async () => {
    const page = await browser.context.newPage();
    const problems = consoleProblems(page);
    await signInAs(page, baseUrl, engineer);
    await page.locator('[data-test=scenario-row]', { hasText: 'Gantry' }).locator('a[data-test=open-scenario]').click();
    await page.waitForURL('**/bench/*');
    // Software WebGL compiles the 3D view's shaders on the page's thread: let that finish first.
    await page.locator('[data-test=joint-view] canvas').waitFor({ timeout: 20_000 });
    await expect.poll(() => page.locator('[data-test=closed-form-latex] .katex').count(), { timeout: 20_000 }).toBeGreaterThan(0);
    expect(await page.locator('[data-test=kick-torque-impulse]').isDisabled()).toBe(true);
    expect(await page.locator('[data-test=pause]').isDisabled()).toBe(true);

    await page.selectOption('[data-test=speed]', '1');
    await page.click('[data-test=run]');
    await expect.poll(() => statusText(page), { timeout: 20_000 }).toMatch(/running/);
    await expect.poll(async () => firstNumber(await statusText(page)), { timeout: 20_000 }).toBeGreaterThan(0.8);

    await page.click('[data-test=pause]');
    await expect.poll(() => statusText(page)).toMatch(/^paused t = \d+\.\d\d s$/);
    const pausedAt = firstNumber(await statusText(page));
    expect(pausedAt).toBeGreaterThan(0.8);
    expect(pausedAt).toBeLessThan(3);
    // Let the chart draw what arrived before the pause took effect.
    await page.waitForTimeout(300);
    const held = await chartSamples(page);
    await page.waitForTimeout(600);
    expect(await chartSamples(page)).toBe(held);
    expect(await statusText(page)).toMatch(/paused/);

    await scrubTo(page, 0.5);
    await page.locator('[data-test=scrub-readout]').waitFor();
    await expect.poll(() => reading(page, 't')).toBeCloseTo(0.5, 2);
    const scrubbedAngle = await reading(page, 'angle');
    expect(Number.isFinite(scrubbedAngle)).toBe(true);
    // The joint shows the scrubbed sample (the readout rounds to four figures).
    await expect.poll(async () => Number(await page.locator('[data-test=joint-view]').getAttribute('data-angle'))).toBeCloseTo(scrubbedAngle, 3);
    expect(await page.locator('[data-test=scrub-readout]').textContent()).toMatch(/saturating\s*no/);
    expect(await chartSamples(page)).toBe(held);

    await page.click('[data-test=resume]');
    await expect.poll(() => statusText(page)).toMatch(/running/);
    await expect.poll(() => chartSamples(page)).toBeGreaterThan(held);

    await page.fill('input[name="kick.amplitude"]', '0.02');
    await page.click('[data-test=kick-torque-impulse]');
    await expect.poll(() => page.locator('[data-test=kick-list] li').count()).toBe(1);
    const kickText = (await page.locator('[data-test=kick-list] li').textContent()) ?? '';
    expect(kickText).toContain('torque impulse 0.02 N·m·s at t =');
    const kickTime = Number(/at t = ([0-9.]+)/.exec(kickText)?.[1]);
    expect(kickTime).toBeGreaterThan(pausedAt);
    expect(kickTime).toBeLessThan(3);
    // A kick is not an edit of the scenario: the tuning form stays at its saved values.
    expect(await page.locator('[data-test=reset-edits]').isDisabled()).toBe(true);

    await expect.poll(() => statusText(page), { timeout: 20_000 }).toMatch(/finished/);
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
    await expect.poll(() => reading(page, 't')).toBeCloseTo(1.5, 2);
    await page.screenshot({ path: `${ARTIFACTS}/bench-live-controls.png`, fullPage: true });
    expect(problems).toEqual([]);
    await page.close();
  });
});
