import { mkdirSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { solveClosedForm } from '../shared/closed-form';
import { parseScenario } from '../shared/scenario/parse-scenario';
import type { Scenario } from '../shared/scenario/scenario-schema';
import { DEMO_ACCOUNTS } from '../sim-server/db/seed-demo';
import { launchBrowser } from './chromium';
import { consoleProblems, signInAs } from './sign-in-as';

const ARTIFACTS = 'test-results';
const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;
const baseUrl = inject('baseUrl');
const PANEL = '[data-test=root-locus-panel]';

const text = async (page: Page, selector: string) => ((await page.locator(selector).first().textContent()) ?? '').replace(/\s+/g, ' ').trim();
/** "re ± imj rad/s" or "re rad/s" as the panels write a pole (upper half-plane only). */
const poleOf = (line: string) => {
  const numbers = [...line.matchAll(/-?\d+(\.\d+)?(e[+-]?\d+)?/g)].map((m) => Number(m[0]));
  return { re: numbers[0]!, im: line.includes('±') ? numbers[1]! : 0 };
};
const byPlace = (a: { re: number; im: number }, b: { re: number; im: number }) => a.re - b.re || a.im - b.im;
/** Four significant figures agree. */
const agrees = (shown: number, value: number) => Math.abs(shown - value) <= 5e-4 * Math.abs(value) + 1e-12;

async function storedScenario(page: Page, id: string): Promise<Scenario> {
  const stored = await page.evaluate(async (path) => ((await (await fetch(path)).json()) as { scenario: unknown }).scenario, `/api/scenarios/${id}`);
  const parsed = parseScenario(stored);
  if (!parsed.ok) throw new Error('stored scenario refused');
  return parsed.value;
}

describe('root locus in Chromium', () => {
  let browser: Awaited<ReturnType<typeof launchBrowser>>;
  beforeAll(async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    browser = await launchBrowser();
  });
  afterAll(() => browser?.close());

  it("draws the wrist demo's locus over kp with the draft's poles where the closed-form panel puts them", async () => {
    const page = await browser.context.newPage();
    const problems = consoleProblems(page);
    await signInAs(page, baseUrl, engineer);
    await page.locator('[data-test=scenario-row]', { hasText: 'Wrist pitch' }).locator('a[data-test=open-scenario]').click();
    await page.waitForURL('**/bench/*');
    const scenario = await storedScenario(page, new URL(page.url()).pathname.split('/').at(-1)!);
    const solved = solveClosedForm(scenario);
    if (!solved.ok) throw new Error('no closed form');

    await expect.poll(() => page.locator(`${PANEL} [data-test=root-locus-chart]`).getAttribute('data-traces'), { timeout: 30_000 }).not.toBe('0');
    expect(await text(page, `${PANEL} [data-test=locus-default-range]`)).toBe(`Blank ends take the default range, 0 to ${3 * scenario.controller.kp} (3× the draft's kp).`);
    expect(await text(page, `${PANEL} h3`)).toBe(`Poles at kp = ${scenario.controller.kp} (the draft's)`);

    // The read-out beside the locus and the closed-form panel list the same poles.
    await page.locator('[data-test=poles] li').first().waitFor();
    const closedFormPanel = (await page.locator('[data-test=poles] li').allTextContents()).map(poleOf).sort(byPlace);
    const locusPanel = (await page.locator(`${PANEL} [data-test=locus-current-poles] li`).allTextContents()).map(poleOf).sort(byPlace);
    expect(locusPanel).toEqual(closedFormPanel);
    expect(locusPanel.length).toBeGreaterThan(0);

    // The marked poles on the plot are the closed form's, each conjugate included.
    const plot = await page.locator(`${PANEL} .js-plotly-plot`).evaluate((el) => {
      const gd = el as unknown as { data: { name: string; mode: string; x: number[]; y: number[] }[]; layout: { shapes: { x0: number; x1: number; xref: string; yref: string }[] } };
      return { traces: gd.data.map((t) => ({ name: t.name, mode: t.mode, x: t.x, y: t.y })), shapes: gd.layout.shapes };
    });
    const current = plot.traces.find((t) => t.name === `poles at kp = ${scenario.controller.kp}`)!;
    const drawn = current.x.map((re, i) => ({ re, im: current.y[i]! })).sort(byPlace);
    const want = solved.value.poles.flatMap((p) => Array.from({ length: p.multiplicity }, () => ({ re: p.re, im: p.im }))).sort(byPlace);
    expect(drawn).toHaveLength(want.length);
    drawn.forEach((p, i) => {
      expect(agrees(p.re, want[i]!.re)).toBe(true);
      expect(agrees(p.im, want[i]!.im)).toBe(true);
    });
    // One line per pole, and the imaginary axis.
    expect(plot.traces.filter((t) => t.mode === 'lines')).toHaveLength(want.length);
    expect(plot.shapes.some((s) => s.xref === 'x' && s.yref === 'paper' && s.x0 === 0 && s.x1 === 0)).toBe(true);
    await page.locator(PANEL).screenshot({ path: `${ARTIFACTS}/root-locus-wrist.png` });

    // An edit moves the marked poles with the closed form's.
    await page.fill('input[name="controller.kp"]', '12');
    await expect.poll(() => text(page, `${PANEL} h3`)).toBe("Poles at kp = 12 (the draft's)");
    const edited = solveClosedForm({ ...scenario, controller: { ...scenario.controller, kp: 12 } });
    if (!edited.ok) throw new Error('no closed form');
    const shown = (await page.locator(`${PANEL} [data-test=locus-current-poles] li`).allTextContents()).map(poleOf).sort(byPlace);
    const upper = edited.value.poles.filter((p) => p.im >= 0).sort(byPlace);
    expect(shown).toHaveLength(upper.length);
    shown.forEach((p, i) => expect(agrees(p.re, upper[i]!.re) && agrees(p.im, upper[i]!.im)).toBe(true));
    expect(problems).toEqual([]);
    await page.close();
  });

  it('says plainly that an open-loop demo has no root locus', async () => {
    const page = await browser.context.newPage();
    await signInAs(page, baseUrl, engineer);
    await page.locator('[data-test=scenario-row]', { hasText: 'Elbow on its spring' }).locator('a[data-test=open-scenario]').click();
    await page.waitForURL('**/bench/*');
    await expect.poll(() => text(page, `${PANEL} [data-test=locus-open-loop]`)).toContain('runs open loop: there is no controller gain to vary');
    expect(await page.locator(`${PANEL} [data-test=root-locus-chart]`).count()).toBe(0);
    await page.close();
  });
});
