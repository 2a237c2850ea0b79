import { mkdirSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEFAULT_FREQUENCY_GRID } from '../shared/frequency/frequency-grid';
import { type FrequencyResponse, frequencyResponseOf } from '../shared/frequency/frequency-response';
import { parseScenario } from '../shared/scenario/parse-scenario';
import type { Scenario } from '../shared/scenario/scenario-schema';
import { DEMO_ACCOUNTS } from '../sim-server/db/seed-demo';
import { launchBrowser } from './chromium';
import { consoleProblems, signInAs } from './sign-in-as';

const ARTIFACTS = 'test-results';
const engineer = DEMO_ACCOUNTS.find((a) => a.role === 'engineer')!;
const baseUrl = inject('baseUrl');
const PANEL = '[data-test=frequency-panel]';

const text = async (page: Page, selector: string) => ((await page.locator(selector).first().textContent()) ?? '').replace(/\s+/g, ' ').trim();
/** The first number in a text, e.g. 72.59 from "72.59°" or 35.91 from "at the gain crossover, 35.91 rad/s". */
const numberIn = (value: string) => {
  const match = /-?\d+(\.\d+)?(e[+-]?\d+)?/.exec(value);
  return match ? Number(match[0]) : Number.NaN;
};
/** The panel prints four significant figures: a figure agrees when it is the value so rounded. */
const agrees = (shown: number, value: number) => Math.abs(shown - value) <= 5e-4 * Math.abs(value) + 1e-12;

/** The stored scenario the bench shows, read through the API as the signed-in page reads it. */
async function storedScenario(page: Page, id: string): Promise<Scenario> {
  const stored = await page.evaluate(async (path) => ((await (await fetch(path)).json()) as { scenario: unknown }).scenario, `/api/scenarios/${id}`);
  const parsed = parseScenario(stored);
  if (!parsed.ok) throw new Error(`stored scenario refused: ${JSON.stringify(parsed.errors)}`);
  return parsed.value;
}

function responseOf(scenario: Scenario): FrequencyResponse {
  const result = frequencyResponseOf(scenario, DEFAULT_FREQUENCY_GRID);
  if (!result.ok) throw new Error('default grid refused');
  return result.value;
}

/** Phase margin and gain crossover as the panel shows them. */
async function shownPhaseMargin(page: Page): Promise<{ margin: number; crossover: number }> {
  return {
    margin: numberIn(await text(page, `${PANEL} [data-test=phaseMargin] [data-test=value]`)),
    crossover: numberIn(await text(page, `${PANEL} [data-test=phaseMargin] [data-test=detail]`)),
  };
}

describe('frequency panel in Chromium', () => {
  let browser: Awaited<ReturnType<typeof launchBrowser>>;
  beforeAll(async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    browser = await launchBrowser();
  });
  afterAll(() => browser?.close());

  it("reads the wrist demo's margins as the closed form gives them, draws the Bode chart, and follows a gain edit", async () => {
    const page = await browser.context.newPage();
    const problems = consoleProblems(page);
    await signInAs(page, baseUrl, engineer);
    await page.locator('[data-test=scenario-row]', { hasText: 'Wrist pitch' }).locator('a[data-test=open-scenario]').click();
    await page.waitForURL('**/bench/*');
    const id = new URL(page.url()).pathname.split('/').at(-1)!;
    const scenario = await storedScenario(page, id);
    const want = responseOf(scenario);
    // The demo's loop has a gain crossover and no phase crossover; the test relies on both.
    expect(want.margins.phaseMarginDeg).not.toBeNull();
    expect(want.margins.gainMarginDb).toBeNull();

    await expect.poll(() => text(page, `${PANEL} [data-test=frequency-verdict]`)).toBe(want.notes[0]);
    const shown = await shownPhaseMargin(page);
    expect(agrees(shown.margin, want.margins.phaseMarginDeg!)).toBe(true);
    expect(agrees(shown.crossover, want.margins.gainCrossover!)).toBe(true);
    expect(await text(page, `${PANEL} [data-test=phaseMargin] [data-test=value]`)).toMatch(/°$/);
    expect(await text(page, `${PANEL} [data-test=gainMargin] [data-test=value]`)).toBe('unbounded');
    expect(agrees(numberIn(await text(page, `${PANEL} [data-test=bandwidth] [data-test=value]`)), want.margins.bandwidth!)).toBe(true);
    expect(await text(page, `${PANEL} [data-test=frequency-notes]`)).toBe(want.notes.slice(1).join(' '));

    // Plotly draws three paths on each of the two panels (SVG lines) and the gain crossover marker.
    await expect.poll(() => page.locator(`${PANEL} [data-test=bode-chart]`).getAttribute('data-traces')).toBe('7');
    const drawn = await page.locator(`${PANEL} [data-test=bode-chart] .scatterlayer path.js-line`).evaluateAll((paths) => paths.filter((p) => (p.getAttribute('d') ?? '').length > 20).length);
    expect(drawn).toBe(6);
    expect(await page.locator(`${PANEL} [data-test=bode-chart] .legendtext`).allTextContents()).toEqual(['loop L(jω)', 'reference → angle', 'torque → angle', 'gain crossover']);
    // Hovering at the gain crossover gives a read-out (of the marker or the loop line through it,
    // whichever Plotly finds closest). Plotly's drag layer lies over the marker and takes the
    // pointer, so the hover skips Playwright's hit test.
    await page.locator(`${PANEL} [data-test=bode-chart] .scatterlayer .point`).first().hover({ force: true });
    const hoverText = async () => (await page.locator(`${PANEL} [data-test=bode-chart] .hoverlayer .hovertext`).allTextContents()).join(' ');
    await expect.poll(hoverText).toMatch(/ω = [0-9.]+ rad\/s/);
    await page.locator(PANEL).screenshot({ path: `${ARTIFACTS}/frequency-panel-wrist.png` });
    await page.mouse.move(0, 0);
    await page.screenshot({ path: `${ARTIFACTS}/frequency-panel-bench.png`, fullPage: true });

    // Less derivative gain: less phase lead at the crossover, so a smaller phase margin.
    await page.fill('input[name="controller.kd"]', '0.15');
    const softer = responseOf({ ...scenario, controller: { ...scenario.controller, kd: 0.15 } });
    expect(softer.margins.phaseMarginDeg!).toBeLessThan(want.margins.phaseMarginDeg!);
    await expect.poll(async () => agrees((await shownPhaseMargin(page)).margin, softer.margins.phaseMarginDeg!)).toBe(true);
    expect(agrees((await shownPhaseMargin(page)).crossover, softer.margins.gainCrossover!)).toBe(true);
    expect(agrees(numberIn(await text(page, `${PANEL} [data-test=bandwidth] [data-test=value]`)), softer.margins.bandwidth!)).toBe(true);

    // A grid upside down is refused under its field; the margins stay those of the last valid grid.
    await page.fill('input[name="grid-to"]', '0.05');
    await expect.poll(() => text(page, `${PANEL} [data-test=grid-error-to]`)).toBe('must be above from');
    expect(await text(page, `${PANEL} [data-test=frequency-blocked]`)).toContain('Fix the frequency grid');
    expect(agrees((await shownPhaseMargin(page)).margin, softer.margins.phaseMarginDeg!)).toBe(true);
    await page.locator(PANEL).screenshot({ path: `${ARTIFACTS}/frequency-panel-grid-error.png` });

    expect(problems).toEqual([]);
    await page.close();
  });

  it('says why an open-loop demo has no margins and draws only torque → angle', async () => {
    const page = await browser.context.newPage();
    const problems = consoleProblems(page);
    await signInAs(page, baseUrl, engineer);
    await page.locator('[data-test=scenario-row]', { hasText: 'Elbow on its spring' }).locator('a[data-test=open-scenario]').click();
    await page.waitForURL('**/bench/*');
    const scenario = await storedScenario(page, new URL(page.url()).pathname.split('/').at(-1)!);
    expect(scenario.controller.mode).toBe('open-loop');
    const want = responseOf(scenario);

    await expect.poll(() => text(page, `${PANEL} [data-test=frequency-verdict]`)).toBe(want.notes[0]);
    expect(want.notes[0]).toContain('open loop');
    expect(await page.locator(`${PANEL} [data-test=margins]`).count()).toBe(0);
    expect(await text(page, `${PANEL} [data-test=frequency-paths]`)).toMatch(/^Open loop: only torque → angle is drawn/);
    await expect.poll(() => page.locator(`${PANEL} [data-test=bode-chart]`).getAttribute('data-traces')).toBe('2');
    expect(await page.locator(`${PANEL} [data-test=bode-chart] .legendtext`).allTextContents()).toEqual(['torque → angle']);
    expect(problems).toEqual([]);
    await page.close();
  });
});
