import { mkdirSync } from 'node:fs';
import type { Page, Request } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../sim-server/db/seed-demo';
import { launchBrowser } from './chromium';
import { consoleProblems, signInAs } from './sign-in-as';

const ARTIFACTS = 'test-results';
const baseUrl = inject('baseUrl');
const account = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!;
const engineer = account('engineer');
const lead = account('lead');
const viewer = account('viewer');

// The other browser tests drive "Wrist pitch" and "Elbow on its spring"; this one owns the shoulder demo.
// Every run adds revisions to it, so nothing below depends on how many it already has.
const SCENARIO = 'Shoulder hold: payload bump';
// A marker unique to this run, so a second run against the same database finds its own notes.
const RUN = `e2e-${Date.now().toString(36)}`;

/** The library row of the scenario by its exact name (copies have longer names). */
function scenarioRow(page: Page) {
  return page.locator('[data-test=scenario-row]').filter({ has: page.locator('a[data-test=open-scenario]', { hasText: new RegExp(`^\\s*${SCENARIO.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\\s*$`) }) });
}

/** Opens the scenario on the bench from the library and returns its id. */
async function openOnBench(page: Page): Promise<number> {
  await page.goto(`${baseUrl}/library`);
  await scenarioRow(page).locator('a[data-test=open-scenario]').click();
  await page.waitForURL('**/bench/*');
  await expect.poll(() => page.locator('[data-test=bench-title]').textContent()).toContain(SCENARIO);
  return Number(/\/bench\/(\d+)/.exec(page.url())![1]);
}

/** A kp different from the one shown, kept in a sane range for the demo joint (N·m/rad). */
async function nextKp(page: Page): Promise<string> {
  const shown = Number(await page.inputValue('input[name="controller.kp"]'));
  return (shown >= 3.9 ? 3.2 : Math.round((shown + 0.1) * 10) / 10).toFixed(1);
}

/** Tunes kp on the bench and saves it as a revision; returns the new revision's number. */
async function tuneAndSave(page: Page, note: string): Promise<number> {
  const kp = await nextKp(page);
  await page.fill('input[name="controller.kp"]', kp);
  await page.fill('[data-test=revision-note]', note);
  await expect.poll(() => page.locator('[data-test=save-revision]').isEnabled()).toBe(true);
  await page.click('[data-test=save-revision]');
  await expect.poll(() => page.locator('[data-test=save-done]').textContent()).toMatch(/Saved as revision \d+/);
  const text = (await page.locator('[data-test=save-done]').textContent()) ?? '';
  return Number(/revision (\d+)/.exec(text)![1]);
}

describe('team library in Chromium: tune, save, hand off, review, sign off', () => {
  let engineerBrowser: Awaited<ReturnType<typeof launchBrowser>>;
  let leadBrowser: Awaited<ReturnType<typeof launchBrowser>>;
  let scenarioId = 0;
  let savedRevision = 0;

  beforeAll(async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    [engineerBrowser, leadBrowser] = await Promise.all([launchBrowser(), launchBrowser()]);
  });
  afterAll(async () => {
    await Promise.all([engineerBrowser?.close(), leadBrowser?.close()]);
  });

  it('the engineer tunes kp on the bench, saves a revision and hands it to the lead with a message', async () => {
    const page = await engineerBrowser.context.newPage();
    const problems = consoleProblems(page);
    const mutating: Request[] = [];
    page.on('request', (request) => {
      if (request.url().includes('/api/') && ['POST', 'PUT', 'PATCH', 'DELETE'].includes(request.method())) mutating.push(request);
    });
    await signInAs(page, baseUrl, engineer);
    scenarioId = await openOnBench(page);
    savedRevision = await tuneAndSave(page, `kp retuned ${RUN}`);

    await page.click('a[data-test=open-scenario-page]');
    await page.waitForURL(`**/library/${scenarioId}`);
    const row = page.locator(`[data-test=revision-row][data-revision="${savedRevision}"]`);
    await expect.poll(() => row.textContent()).toContain(`kp retuned ${RUN}`);

    await page.click('[data-test=hand-off]');
    await page.click('[data-test=hand-off-to]');
    await page.locator('mat-option', { hasText: 'Tomás' }).click();
    await page.fill('[data-test=hand-off-message]', `Please review kp before the floor run (${RUN}).`);
    await page.click('[data-test=confirm-hand-off]');
    await expect.poll(() => page.locator('[data-test=action-message]').textContent()).toContain('Handed to Tomás');

    // Angular echoed the XSRF-TOKEN cookie on every mutating call after sign-in (the server refuses them without it).
    const afterSignIn = mutating.filter((request) => !request.url().endsWith('/api/auth/sign-in'));
    expect(afterSignIn.map((request) => `${request.method()} ${new URL(request.url()).pathname}`)).toEqual([`PUT /api/scenarios/${scenarioId}`, `POST /api/scenarios/${scenarioId}/handoffs`]);
    for (const request of afterSignIn) expect((await request.allHeaders())['x-xsrf-token']).toMatch(/^[A-Za-z0-9_-]{20,}$/);
    expect(problems).toEqual([]);
    await page.close();
  });

  it('the lead finds it under "Handed to me", comments with a mention and signs off after acknowledging the caution', async () => {
    expect(savedRevision).toBeGreaterThan(0);
    const page = await leadBrowser.context.newPage();
    const problems = consoleProblems(page);
    await signInAs(page, baseUrl, lead);
    await page.click('[data-test=nav-handed-to-me]');
    await page.waitForURL('**/handed-to-me');
    const handoff = page.locator('[data-test=handed-to-me-row]', { hasText: SCENARIO });
    await expect.poll(() => handoff.textContent()).toContain(RUN);
    await handoff.locator('a[data-test=open-handoff]').click();
    await page.waitForURL(`**/library/${scenarioId}`);
    await expect.poll(() => page.locator('[data-test=viewed-revision]').textContent()).toContain(`Revision ${savedRevision}`);
    // A lead reviews but does not own the scenario: no save controls.
    expect(await page.locator('[data-test=save-revision]').count()).toBe(0);

    await page.fill('[data-test=comment-body]', `Checked the kick and the hold, fine by me @${engineer.email} (${RUN})`);
    await page.click('[data-test=post-comment]');
    const comment = page.locator('[data-test=comment-text]', { hasText: RUN });
    await expect.poll(() => comment.count()).toBe(1);
    expect(await comment.locator('[data-test=mention]').textContent()).toBe(`@${engineer.email}`);

    await page.click('[data-test=sign-off]');
    await expect.poll(() => page.locator('[data-test=safety-caution]').textContent()).toContain('A simulation is not a safety validation');
    expect(await page.locator('[data-test=confirm-sign-off]').isDisabled()).toBe(true);
    await page.click('[data-test=acknowledge-safety] input');
    await page.fill('[data-test=sign-off-note]', `Gains accepted (${RUN})`);
    await expect.poll(() => page.locator('[data-test=confirm-sign-off]').isEnabled()).toBe(true);
    await page.click('[data-test=confirm-sign-off]');
    await expect.poll(() => page.locator('[data-test=action-message]').textContent()).toContain(`Revision ${savedRevision} is signed off`);
    await expect.poll(() => page.locator(`[data-test=revision-row][data-revision="${savedRevision}"] [data-test=signed-off-badge]`).count()).toBe(1);
    // A signed-off revision cannot be signed off again.
    await expect.poll(() => page.locator('[data-test=sign-off]').count()).toBe(0);
    await page.screenshot({ path: `${ARTIFACTS}/team-library-signed-off.png`, fullPage: true });
    expect(problems).toEqual([]);
    await page.close();
  });

  it('the engineer reloads and sees the sign-off badge on that revision', async () => {
    const page = await engineerBrowser.context.newPage();
    await page.goto(`${baseUrl}/library/${scenarioId}`);
    const badge = page.locator(`[data-test=revision-row][data-revision="${savedRevision}"] [data-test=signed-off-badge]`);
    await expect.poll(() => badge.textContent()).toContain('Tomás');
    await expect.poll(() => page.locator('[data-test=scenario-status]').first().textContent()).toContain('Signed off');

    // The parameter diff of the signed-off revision against the one before it shows the kp change
    // and overlays both closed-form traces.
    await page.locator(`[data-test=revision-row][data-revision="${savedRevision - 1}"] [data-test=compare-revision]`).check();
    await page.locator(`[data-test=revision-row][data-revision="${savedRevision}"] [data-test=compare-revision]`).check();
    const kpRow = page.locator('[data-test=diff-row][data-path="controller.kp"]');
    await expect.poll(() => kpRow.count()).toBe(1);
    expect(await kpRow.locator('.before').textContent()).not.toBe(await kpRow.locator('.after').textContent());
    await expect.poll(() => page.locator('[data-test=trace-overlay] path[data-test=overlay-to]').getAttribute('d'), { timeout: 20_000 }).toMatch(/^M[\d.,L-]+$/);
    await page.screenshot({ path: `${ARTIFACTS}/team-library-diff.png`, fullPage: true });
    await page.close();
  });

  it('a viewer sees the scenario but no edit, save, hand-off, comment or sign-off controls', async () => {
    const page = await leadBrowser.context.newPage();
    await page.goto(`${baseUrl}/library`);
    await page.click('[data-test=sign-out]');
    await page.waitForURL('**/sign-in');
    await signInAs(page, baseUrl, viewer);
    await page.goto(`${baseUrl}/library/${scenarioId}`);
    await expect.poll(() => page.locator('[data-test=scenario-title]').textContent()).toContain(SCENARIO);
    await expect.poll(() => page.locator('[data-test=read-only-parameters]').count()).toBe(1);
    for (const control of ['save-revision', 'hand-off', 'sign-off', 'comment-body', 'post-comment', 'rename', 'archive', 'duplicate', 'restore-revision']) {
      expect(await page.locator(`[data-test=${control}]`).count(), control).toBe(0);
    }
    expect(await page.locator('[data-test=nav-team]').count()).toBe(0);

    await page.goto(`${baseUrl}/bench/${scenarioId}`);
    await expect.poll(() => page.locator('[data-test=bench-title]').textContent()).toContain(SCENARIO);
    await expect.poll(() => page.locator('a[data-test=open-scenario-page]').count()).toBe(1);
    expect(await page.locator('[data-test=save-revision]').count()).toBe(0);
    await page.close();
  });

  it('a save that started from an older revision shows the 409 choice and loses nothing', async () => {
    const first = await engineerBrowser.context.newPage();
    const second = await engineerBrowser.context.newPage();
    await openOnBench(first);
    await openOnBench(second);
    const theirs = await tuneAndSave(first, `first tab ${RUN}`);

    // The second tab still edits the revision before `theirs`.
    await second.fill('input[name="controller.kp"]', '3.05');
    await second.click('[data-test=save-revision]');
    const choice = second.locator('[data-test=stale-save]');
    await expect.poll(() => choice.textContent()).toContain(`saved revision ${theirs}`);
    expect(await choice.locator('[data-test=save-as-copy]').count()).toBe(1);
    expect(await choice.locator('[data-test=reload-theirs]').count()).toBe(1);
    // Nothing lost: the edit is still on screen while the choice is open.
    expect(await second.inputValue('input[name="controller.kp"]')).toBe('3.05');
    await second.screenshot({ path: `${ARTIFACTS}/team-library-stale-save.png`, fullPage: true });

    await choice.locator('[data-test=reload-theirs]').click();
    await expect.poll(() => second.locator('[data-test=stale-save]').count()).toBe(0);
    expect(await second.inputValue('input[name="controller.kp"]')).toBe(await first.inputValue('input[name="controller.kp"]'));
    await Promise.all([first.close(), second.close()]);
  });
});

describe('team management in Chromium: an admin invites, the invitee joins through the mailed link', () => {
  it('invites from the Team page, reads the link in the dev mailbox and joins the team with the invited role', async () => {
    const admin = account('admin');
    const invitee = `new.${RUN}@demo.kinetwin.test`;
    const [adminBrowser, inviteeBrowser] = await Promise.all([launchBrowser(), launchBrowser()]);
    try {
      const page = await adminBrowser.context.newPage();
      await signInAs(page, baseUrl, admin);
      await page.click('[data-test=nav-team]');
      await page.waitForURL('**/team');
      await expect.poll(() => page.locator('[data-test=member-row]').count()).toBeGreaterThanOrEqual(4);
      await page.fill('[data-test=invite-email]', invitee);
      await page.click('[data-test=send-invitation]');
      await expect.poll(() => page.locator('[data-test=team-message]').textContent()).toContain(`Invitation sent to ${invitee}`);
      await expect.poll(() => page.locator('[data-test=invitation-row]', { hasText: invitee }).count()).toBe(1);

      await page.click('[data-test=nav-mailbox]');
      await page.waitForURL('**/mailbox');
      const mail = page.locator('[data-test=mail-message]', { hasText: invitee }).first();
      await mail.locator('summary').click();
      const text = (await mail.locator('[data-test=mail-text]').textContent()) ?? '';
      // The mailed address starts with APP_BASE_URL; the test server listens on a port picked at start, so keep only the token.
      const token = /accept-invitation\?token=([A-Za-z0-9_-]{43})/.exec(text)?.[1];
      expect(token, text).toBeDefined();

      const joining = await inviteeBrowser.context.newPage();
      await joining.goto(`${baseUrl}/accept-invitation?token=${token}`);
      await expect.poll(() => joining.locator('[data-test=invitation-offer]').textContent()).toContain(invitee);
      expect(await joining.locator('[data-test=invitation-offer]').textContent()).toContain('engineer');
      await joining.fill('[data-test=invitation-name]', `Invited ${RUN}`);
      await joining.fill('[data-test=invitation-password]', 'copper-gantry-42');
      await joining.click('[data-test=accept-invitation]');
      await joining.waitForURL('**/library');
      await expect.poll(() => joining.locator('[data-test=signed-in-user]').textContent()).toContain('(engineer)');
      await expect.poll(() => joining.locator('[data-test=scenario-row]').count()).toBeGreaterThanOrEqual(4);

      // The link works once.
      const again = await inviteeBrowser.context.newPage();
      await again.goto(`${baseUrl}/accept-invitation?token=${token}`);
      await expect.poll(() => again.locator('[data-test=invitation-error]').count()).toBe(1);
    } finally {
      await Promise.all([adminBrowser.close(), inviteeBrowser.close()]);
    }
  });
});
