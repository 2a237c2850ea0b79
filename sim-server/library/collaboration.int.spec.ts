import { desc, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { outbox } from '../../drizzle/schema';
import { MAX_COMMENT_LENGTH, MAX_HANDOFF_MESSAGE_LENGTH, SAFETY_CAUTION } from '../../shared/protocol/library-api';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestServer } from '../testing/test-server';

describe('hand-off, comments with mentions, sign-off notice, activity and the dev mailbox', () => {
  let t: TestServer;
  let team: Awaited<ReturnType<typeof createTestTeam>>;
  let other: Awaited<ReturnType<typeof createTestTeam>>;
  let scenarioId: number;

  beforeAll(async () => {
    t = await startTestServer();
    [team, other] = await Promise.all([createTestTeam(t, 'Review lab', ['engineer']), createTestTeam(t, 'Elsewhere lab')]);
    const res = await team.members.engineer.api.post('/api/scenarios', { scenario: { ...demoScenarioDocument(), name: 'Hand-off axis' }, note: 'ready for review' });
    scenarioId = (await readJson(res)).id;
  });
  afterAll(() => t.close());

  const mailTo = async (email: string) => t.database.db.select().from(outbox).where(eq(outbox.toAddress, email)).orderBy(desc(outbox.id));

  it('hands a scenario to a lead with a message: e-mail in the outbox and a row under "Handed to me"', async () => {
    const { engineer, lead } = team.members;
    const res = await engineer.api.post(`/api/scenarios/${scenarioId}/handoffs`, { toUserId: lead.id, access: 'view', message: 'Please check the <kick> on step 2 & sign off.' });
    expect(res.status).toBe(201);
    expect(await readJson(res)).toMatchObject({ scenario: { id: scenarioId, name: 'Hand-off axis' }, from: { id: engineer.id }, to: { id: lead.id }, access: 'view', revision: 1 });

    const [mail] = await mailTo(lead.email);
    expect(mail).toMatchObject({ subject: `${engineer.displayName} handed you "Hand-off axis"`, fromAddress: t.config.mailFrom, teamId: team.teamId });
    expect(mail!.text).toContain('> Please check the <kick> on step 2 & sign off.');
    expect(mail!.text).toContain(`${t.baseUrl}/library/${scenarioId}`);
    expect(mail!.html).toContain('Please check the &lt;kick&gt; on step 2 &amp; sign off.');
    expect(mail!.html).not.toMatch(/<img|https?:\/\/(?!127\.0\.0\.1)/);

    const received = await readJson(await lead.api.get('/api/handoffs/received'));
    expect(received.items).toEqual([expect.objectContaining({ scenario: { id: scenarioId, name: 'Hand-off axis' }, from: { id: engineer.id, displayName: engineer.displayName }, message: 'Please check the <kick> on step 2 & sign off.' })]);
    expect((await readJson(await engineer.api.get('/api/handoffs/sent'))).items).toHaveLength(1);
    expect((await readJson(await team.members.viewer.api.get('/api/handoffs/received'))).items).toEqual([]);
  });

  it('lets an edit hand-off grant editing, and refuses bad hand-offs clearly', async () => {
    const { engineer, lead, viewer } = team.members;
    const before = await readJson(await lead.api.get(`/api/scenarios/${scenarioId}`));
    expect(before.access.edit).toBe(false);
    expect((await lead.api.put(`/api/scenarios/${scenarioId}`, { scenario: before.scenario, baseRevision: 1 })).status).toBe(403);
    expect((await engineer.api.post(`/api/scenarios/${scenarioId}/handoffs`, { toUserId: lead.id, access: 'edit', message: 'all yours' })).status).toBe(201);
    expect((await readJson(await lead.api.get(`/api/scenarios/${scenarioId}`))).access.edit).toBe(true);
    expect((await lead.api.put(`/api/scenarios/${scenarioId}`, { scenario: before.scenario, baseRevision: 1, note: 'lead tweak' })).status).toBe(200);
    // "Handed to me" keeps one row per scenario, updated.
    expect((await readJson(await lead.api.get('/api/handoffs/received'))).items).toEqual([expect.objectContaining({ access: 'edit', message: 'all yours' })]);

    const post = (by: typeof engineer, body: unknown) => by.api.post(`/api/scenarios/${scenarioId}/handoffs`, body);
    const cases: [typeof engineer, unknown, number, string][] = [
      [engineer, { toUserId: viewer.id, access: 'edit' }, 400, 'access'],
      [engineer, { toUserId: engineer.id, access: 'view' }, 400, 'toUserId'],
      [engineer, { toUserId: other.members.lead.id, access: 'view' }, 400, 'toUserId'],
      [engineer, { toUserId: 987654, access: 'view' }, 400, 'toUserId'],
      [engineer, { toUserId: lead.id, access: 'own' }, 400, 'access'],
      [engineer, { toUserId: lead.id, access: 'view', message: 'm'.repeat(MAX_HANDOFF_MESSAGE_LENGTH + 1) }, 400, 'message'],
      [team.extra[0]!, { toUserId: lead.id, access: 'edit' }, 403, ''],
    ];
    for (const [by, body, status, field] of cases) {
      const res = await post(by, body);
      const answer = await readJson(res);
      expect(res.status, JSON.stringify(body).slice(0, 80)).toBe(status);
      if (field) expect(answer.error.fields.map((f: { field: string }) => f.field)).toContain(field);
      expect(JSON.stringify(answer)).not.toContain(other.members.lead.displayName);
    }
    // The non-owner engineer may still hand it off to view.
    expect((await post(team.extra[0]!, { toUserId: viewer.id, access: 'view' })).status).toBe(201);
  });

  it('threads comments on a revision and e-mails the teammates mentioned, not outsiders', async () => {
    const { engineer, lead, admin } = team.members;
    const outsider = other.members.admin;
    const top = await lead.api.post(`/api/scenarios/${scenarioId}/revisions/1/comments`, {
      body: `Overshoot looks high. @${engineer.email.toUpperCase()} can you try kd up? cc @${outsider.email} @${lead.email}`,
    });
    expect(top.status).toBe(201);
    const comment = await readJson(top);
    expect(comment).toMatchObject({ revision: 1, parentId: null, author: { id: lead.id }, mentions: [{ id: engineer.id, displayName: engineer.displayName }, { id: lead.id, displayName: lead.displayName }], replies: [] });

    const reply = await engineer.api.post(`/api/scenarios/${scenarioId}/revisions/1/comments`, { body: 'Done in the next revision.', parentId: comment.id });
    expect(reply.status).toBe(201);
    const nested = await admin.api.post(`/api/scenarios/${scenarioId}/revisions/1/comments`, { body: 'Agreed.', parentId: (await readJson(reply)).id });
    expect(nested.status).toBe(201);

    const threads = await readJson(await team.members.viewer.api.get(`/api/scenarios/${scenarioId}/comments?revision=1`));
    expect(threads.items).toHaveLength(1);
    expect(threads.items[0].replies[0]).toMatchObject({ body: 'Done in the next revision.', replies: [{ body: 'Agreed.', author: { id: admin.id } }] });
    expect((await readJson(await team.members.viewer.api.get(`/api/scenarios/${scenarioId}/comments?revision=2`))).items).toEqual([]);

    const [mention] = await mailTo(engineer.email);
    expect(mention).toMatchObject({ subject: `${lead.displayName} mentioned you on "Hand-off axis"`, teamId: team.teamId });
    expect(mention!.text).toContain('Overshoot looks high.');
    expect(await mailTo(outsider.email)).toEqual([]);
    // Mentioning yourself sends nothing.
    expect((await mailTo(lead.email)).filter((m) => m.subject.includes('mentioned you'))).toEqual([]);

    const bad: [unknown, string][] = [
      [{ body: '' }, 'body'],
      [{ body: 'x'.repeat(MAX_COMMENT_LENGTH + 1) }, 'body'],
      [{ body: 'reply to nothing', parentId: 987654 }, 'parentId'],
      [{ body: 'reply across revisions', parentId: comment.id, revision: 2 }, ''],
    ];
    for (const [body, field] of bad) {
      const res = await engineer.api.post(`/api/scenarios/${scenarioId}/revisions/1/comments`, body);
      expect(res.status).toBe(400);
      expect((await readJson(res)).error.fields.map((f: { field: string }) => f.field)).toContain(field);
    }
    expect((await engineer.api.post(`/api/scenarios/${scenarioId}/revisions/99/comments`, { body: 'on nothing' })).status).toBe(404);
  });

  it('tells the owner by e-mail when a lead signs off, with the safety caution', async () => {
    const { engineer, lead } = team.members;
    const res = await lead.api.post(`/api/scenarios/${scenarioId}/revisions/2/sign-off`, { acknowledgeSafety: true, note: 'fine on the bench' });
    expect(res.status).toBe(200);
    const [mail] = await mailTo(engineer.email);
    expect(mail!.subject).toBe('"Hand-off axis" revision 2 is signed off');
    expect(mail!.text).toContain(SAFETY_CAUTION);
    expect(mail!.text).toContain('fine on the bench');
    // The engineer sees it on the scenario.
    expect(await readJson(await engineer.api.get(`/api/scenarios/${scenarioId}`))).toMatchObject({ status: 'signed-off', signOff: { by: { id: lead.id }, note: 'fine on the bench' } });
  });

  it('logs who did what per scenario and per team, newest first, only within the team', async () => {
    const log = await readJson(await team.members.viewer.api.get(`/api/scenarios/${scenarioId}/activity`));
    expect(log.items.map((e: { action: string }) => e.action)).toEqual([
      'revision.signed-off',
      'comment.added',
      'comment.added',
      'comment.added',
      'scenario.handed-off',
      'scenario.saved',
      'scenario.handed-off',
      'scenario.handed-off',
      'scenario.created',
    ]);
    expect(log.items[0]).toMatchObject({ actor: { id: team.members.lead.id }, scenario: { id: scenarioId, name: 'Hand-off axis' }, detail: { revision: 2, safetyAcknowledged: true } });
    const paged = await readJson(await team.members.viewer.api.get(`/api/scenarios/${scenarioId}/activity?page=2&pageSize=4`));
    expect(paged).toMatchObject({ page: 2, pageSize: 4, total: 9 });
    expect(paged.items.map((e: { id: number }) => e.id)).toEqual(log.items.slice(4, 8).map((e: { id: number }) => e.id));

    const teamLog = await readJson(await team.members.viewer.api.get('/api/team/activity?pageSize=100'));
    expect(teamLog.total).toBeGreaterThanOrEqual(9);
    const theirs = await readJson(await other.members.viewer.api.get('/api/team/activity?pageSize=100'));
    expect(theirs.items.every((e: { scenario: { id: number } | null }) => e.scenario?.id !== scenarioId)).toBe(true);
    expect((await team.members.viewer.api.get('/api/team/activity?pageSize=0')).status).toBe(400);
  });

  it("shows the outbox to admins, only their own team's messages", async () => {
    const mine = await readJson(await team.members.admin.api.get('/api/dev/mailbox'));
    expect(mine.items.length).toBeGreaterThanOrEqual(4);
    expect(mine.items.every((m: { to: string }) => !m.to.includes('elsewhere'))).toBe(true);
    expect(mine.items[0]).toEqual({ id: expect.any(Number), to: expect.any(String), from: t.config.mailFrom, subject: expect.any(String), text: expect.any(String), html: expect.stringMatching(/^<!doctype html>/), createdAt: expect.any(String) });
    expect((await readJson(await other.members.admin.api.get('/api/dev/mailbox'))).items).toEqual([]);
    expect((await team.members.lead.api.get('/api/dev/mailbox')).status).toBe(403);
  });
});
