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
/** A measured sweep is one twin run per frequency in a worker on the server; the first also starts that worker. */
const SWEEP = { timeout: 60_000 };

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

  it("measures the twin of the wrist demo on the panel's grid and draws it on the closed form, within 0.01 dB", async () => {
    const page = await browser.context.newPage();
    const problems = consoleProblems(page);
    await signInAs(page, baseUrl, engineer);
    await page.locator('[data-test=scenario-row]', { hasText: 'Wrist pitch' }).locator('a[data-test=open-scenario]').click();
    await page.waitForURL('**/bench/*');
    const scenario = await storedScenario(page, new URL(page.url()).pathname.split('/').at(-1)!);
    // The demo has every effect off: the twin is the linear joint the closed form solves.
    expect(scenario.nonlinear).toEqual({});
    await expect.poll(() => page.locator(`${PANEL} [data-test=bode-chart]`).getAttribute('data-traces')).toBe('7');

    // The default grid has 200 points: the sweep takes 40 of it and says so; the defaults are the server's.
    expect(await text(page, `${PANEL} [data-test=sweep-grid]`)).toBe("On 40 log-spaced frequencies from 0.1 rad/s to 1000 rad/s: the panel's grid, capped at 40 points, because each frequency is a full twin run.");
    expect(await text(page, `${PANEL} [data-test=sweep-amplitude-default]`)).toBe("default: 0.5 rad, the largest of the scenario's reference terms");
    expect(await text(page, `${PANEL} [data-test=sweep-channel] option[value=default]`)).toBe('Default: reference (closed loop)');

    // A shorter grid keeps the test to a handful of twin runs.
    await page.fill('input[name="grid-points"]', '7');
    await expect.poll(() => text(page, `${PANEL} [data-test=sweep-grid]`)).toBe("On 7 log-spaced frequencies from 0.1 rad/s to 1000 rad/s: the panel's grid.");
    await page.click(`${PANEL} [data-test=measure-twin]`);
    await expect.poll(() => page.locator(`${PANEL} [data-test=sweep-running]`).count()).toBe(1);
    await expect.poll(() => text(page, `${PANEL} [data-test=sweep-summary]`), SWEEP).toMatch(/^reference → angle, a sine of 0\.5 rad on the reference: 7 of 7 frequencies measured in [0-9.e-]+ s on the server\.$/);
    expect(await page.locator(`${PANEL} [data-test=sweep-running]`).count()).toBe(0);
    expect(await page.locator(`${PANEL} [data-test=sweep-unmeasured]`).count()).toBe(0);

    const grid = frequencyResponseOf(scenario, { from: 0.1, to: 1000, points: 7 });
    if (!grid.ok) throw new Error('grid refused');
    const want = grid.value.referenceToAngle!;
    const rows = page.locator(`${PANEL} [data-test=sweep-point]`);
    expect(await rows.count()).toBe(7);
    for (let i = 0; i < 7; i++) {
      const row = rows.nth(i);
      const cell = async (name: string) => numberIn((await row.locator(`[data-test=${name}]`).textContent()) ?? '');
      expect(agrees(await cell('frequency'), grid.value.frequency[i]!)).toBe(true);
      expect(agrees(await cell('closed-form-magnitude'), want.magnitudeDb[i]!)).toBe(true);
      // Shown to four figures: the measured figure sits within 0.01 dB of the closed form's, and the gap says so.
      expect(Math.abs((await cell('magnitude')) - want.magnitudeDb[i]!)).toBeLessThanOrEqual(0.01 + 5e-4 * Math.abs(want.magnitudeDb[i]!));
      expect(Math.abs(await cell('magnitude-gap'))).toBeLessThanOrEqual(0.01);
      expect(Math.abs(await cell('phase-gap'))).toBeLessThanOrEqual(0.01);
      expect(await row.locator('[data-test=flags]').textContent()).toBe('');
    }

    // The markers on the chart: the reference path's colour, both panels, on the closed form within 0.01 dB.
    await expect.poll(() => page.locator(`${PANEL} [data-test=bode-chart]`).getAttribute('data-traces')).toBe('9');
    expect(await page.locator(`${PANEL} [data-test=bode-chart] .legendtext`).allTextContents()).toEqual(['loop L(jω)', 'reference → angle', 'torque → angle', 'measured (twin)', 'gain crossover']);
    const markers = await page
      .locator(`${PANEL} [data-test=bode-chart] .js-plotly-plot`)
      .evaluate((plot) => (plot as unknown as { data: { legendgroup?: string; x: number[]; y: (number | null)[]; yaxis: string }[] }).data.filter((t) => t.legendgroup === 'measured').map((t) => ({ x: t.x, y: t.y, yaxis: t.yaxis })));
    expect(markers.map((m) => m.yaxis)).toEqual(['y', 'y2']);
    markers[0]!.y.forEach((db, i) => expect(Math.abs(db! - want.magnitudeDb[i]!)).toBeLessThanOrEqual(0.01));
    markers[1]!.y.forEach((deg, i) => expect(Math.abs(deg! - want.phaseDeg[i]!)).toBeLessThanOrEqual(0.01));
    expect(await page.locator(`${PANEL} [data-test=bode-chart] .scatterlayer .trace .points path`).count()).toBeGreaterThanOrEqual(14);
    await page.locator(PANEL).screenshot({ path: `${ARTIFACTS}/frequency-panel-measured.png` });

    // Another gain is another draft: the measurement stays, marked stale, its markers faded.
    await page.fill('input[name="controller.kd"]', '0.15');
    await expect.poll(() => page.locator(`${PANEL} [data-test=sweep-stale]`).count()).toBe(1);
    await expect.poll(async () => page.locator(`${PANEL} [data-test=bode-chart] .legendtext`).allTextContents()).toContain('measured (twin, stale)');
    expect(problems).toEqual([]);
    await page.close();
  });
});
