import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MAX_REVISION_NOTE_LENGTH, SAFETY_CAUTION, SAFETY_CAUTION_HEADER } from '../../shared/protocol/library-api';
import { parseScenarioText } from '../../shared/scenario/parse-scenario';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestServer } from '../testing/test-server';

describe('scenario library: revisions, concurrency, sign-off, search, import and export', () => {
  let t: TestServer;
  let team: Awaited<ReturnType<typeof createTestTeam>>;
  const wrist = demoScenarioDocument();

  beforeAll(async () => {
    t = await startTestServer();
    team = await createTestTeam(t, 'Library lab', ['engineer']);
  });
  afterAll(() => t.close());

  const as = (role: 'viewer' | 'engineer' | 'lead' | 'admin') => team.members[role].api;
  const create = async (name: string, extra: Record<string, unknown> = {}, role: 'engineer' | 'lead' | 'admin' = 'engineer') => {
    const res = await as(role).post('/api/scenarios', { scenario: { ...wrist, name, ...extra }, note: 'first cut' });
    expect(res.status).toBe(201);
    return readJson(res);
  };
  const withKp = (kp: number) => ({ ...wrist, controller: { ...(wrist.controller as object), kp } });

  it('makes every save a revision with who, when and the note, and opens old revisions read-only', async () => {
    const created = await create('Revision axis');
    expect(created).toMatchObject({ revision: 1, status: 'draft', ownerName: team.members.engineer.displayName, access: { edit: true, archive: true, signOff: false } });
    const saved = await readJson(await as('engineer').put(`/api/scenarios/${created.id}`, { scenario: { ...withKp(11), name: 'Revision axis' }, baseRevision: 1, note: 'stiffer loop' }));
    expect(saved).toMatchObject({ revision: 2, lastChangedBy: team.members.engineer.displayName });
    expect(saved.scenario.controller.kp).toBe(11);

    const list = await readJson(await as('viewer').get(`/api/scenarios/${created.id}/revisions`));
    expect(list.items).toEqual([
      expect.objectContaining({ number: 1, note: 'first cut', author: { id: team.members.engineer.id, displayName: team.members.engineer.displayName }, signOff: null }),
      expect.objectContaining({ number: 2, note: 'stiffer loop' }),
    ]);
    const first = await readJson(await as('viewer').get(`/api/scenarios/${created.id}/revisions/1`));
    expect(first.scenario.controller.kp).toBe((wrist.controller as { kp: number }).kp);
    expect((await as('viewer').get(`/api/scenarios/${created.id}/revisions/3`)).status).toBe(404);
    expect((await as('viewer').get(`/api/scenarios/${created.id}/revisions/zero`)).status).toBe(400);

    const diff = await readJson(await as('viewer').get(`/api/scenarios/${created.id}/diff?from=1&to=2`));
    expect(diff.changes).toEqual([{ section: 'controller', path: 'controller.kp', kind: 'changed', before: (wrist.controller as { kp: number }).kp, after: 11 }]);
    expect((await as('viewer').get(`/api/scenarios/${created.id}/diff?from=1`)).status).toBe(400);
  });

  it('answers a stale save with 409 and both versions, and saves nothing', async () => {
    const { id } = await create('Contested axis');
    expect((await as('engineer').put(`/api/scenarios/${id}`, { scenario: { ...withKp(20), name: 'Contested axis' }, baseRevision: 1, note: 'mine first' })).status).toBe(200);
    const stale = await as('engineer').put(`/api/scenarios/${id}`, { scenario: { ...withKp(30), name: 'Contested axis' }, baseRevision: 1, note: 'also from 1' });
    expect(stale.status).toBe(409);
    const body = await readJson(stale);
    expect(body.error.code).toBe('stale_revision');
    expect(body.current).toMatchObject({ number: 2, note: 'mine first', scenario: { controller: { kp: 20 } } });
    expect(body.yours).toMatchObject({ baseRevision: 1, note: 'also from 1', scenario: { controller: { kp: 30 } } });
    const after = await readJson(await as('engineer').get(`/api/scenarios/${id}`));
    expect(after).toMatchObject({ revision: 2, scenario: { controller: { kp: 20 } } });
    // Saving on top of the newest works, and restoring an old revision makes it the newest.
    expect((await as('engineer').put(`/api/scenarios/${id}`, { scenario: { ...withKp(30), name: 'Contested axis' }, baseRevision: 2 })).status).toBe(200);
    const restored = await readJson(await as('engineer').post(`/api/scenarios/${id}/revisions/1/restore`, { baseRevision: 3 }));
    expect(restored).toMatchObject({ revision: 4, scenario: { controller: { kp: (wrist.controller as { kp: number }).kp } } });
    expect((await as('engineer').post(`/api/scenarios/${id}/revisions/2/restore`, { baseRevision: 3 })).status).toBe(409);
  });

  it('keeps a signed-off revision immutable: later saves start a new unsigned revision', async () => {
    const { id } = await create('Reviewed axis');
    expect((await as('lead').post(`/api/scenarios/${id}/revisions/1/sign-off`, { acknowledgeSafety: false })).status).toBe(400);
    const noAck = await as('lead').post(`/api/scenarios/${id}/revisions/1/sign-off`, {});
    expect(noAck.status).toBe(400);
    expect((await readJson(noAck)).error.message).toContain(SAFETY_CAUTION);
    const signed = await as('lead').post(`/api/scenarios/${id}/revisions/1/sign-off`, { acknowledgeSafety: true, note: 'checked against the bench log' });
    expect(signed.status).toBe(200);
    expect(await readJson(signed)).toMatchObject({ safetyCaution: SAFETY_CAUTION, revision: { number: 1, signOff: { by: { id: team.members.lead.id }, note: 'checked against the bench log' } } });
    expect(await readJson(await as('viewer').get(`/api/scenarios/${id}`))).toMatchObject({ status: 'signed-off', signOff: { by: { id: team.members.lead.id } } });
    expect((await as('admin').post(`/api/scenarios/${id}/revisions/1/sign-off`, { acknowledgeSafety: true })).status).toBe(409);

    const edited = await readJson(await as('engineer').put(`/api/scenarios/${id}`, { scenario: { ...withKp(9), name: 'Reviewed axis' }, baseRevision: 1 }));
    expect(edited).toMatchObject({ revision: 2, status: 'draft', signOff: null });
    const first = await readJson(await as('engineer').get(`/api/scenarios/${id}/revisions/1`));
    expect(first.scenario.controller.kp).toBe((wrist.controller as { kp: number }).kp);
    expect(first.signOff).not.toBeNull();

    // Not even direct SQL may change it: the database refuses.
    const db = t.database.db;
    // Drizzle wraps the driver's error; the database's own words are its cause.
    const refusal = (query: ReturnType<typeof sql>) => db.execute(query).then(() => 'accepted', (err: Error & { cause?: Error }) => err.cause?.message ?? err.message);
    expect(await refusal(sql`UPDATE scenario_revisions SET document = '{}'::jsonb WHERE scenario_id = ${id} AND number = 1`)).toMatch(/append-only/);
    expect(await refusal(sql`UPDATE scenario_revisions SET signed_off_at = NULL WHERE scenario_id = ${id} AND number = 1`)).toMatch(/signed off and immutable/);
    expect(await refusal(sql`DELETE FROM scenario_revisions WHERE scenario_id = ${id}`)).toMatch(/append-only/);
  });

  it("lets an engineer edit only their own scenarios (or ones handed for editing), and duplicate anyone's", async () => {
    const { id } = await create('Lead-owned axis', {}, 'lead');
    const other = team.extra[0]!.api;
    const refused = await other.put(`/api/scenarios/${id}`, { scenario: { ...wrist, name: 'Lead-owned axis' }, baseRevision: 1 });
    expect(refused.status).toBe(403);
    expect((await other.patch(`/api/scenarios/${id}`, { name: 'Hijacked' })).status).toBe(403);
    expect((await other.post(`/api/scenarios/${id}/archive`)).status).toBe(403);
    const copy = await readJson(await other.post(`/api/scenarios/${id}/duplicate`, {}));
    expect(copy).toMatchObject({ name: 'Lead-owned axis (copy)', ownerId: team.extra[0]!.id, revision: 1, access: { edit: true } });
    // An admin may edit anything of the team.
    expect((await as('admin').put(`/api/scenarios/${id}`, { scenario: { ...wrist, name: 'Lead-owned axis' }, baseRevision: 1 })).status).toBe(200);
  });

  it('renames as a new revision, tags, archives and restores (owner or admin)', async () => {
    const { id } = await create('Rename axis');
    const renamed = await readJson(await as('engineer').patch(`/api/scenarios/${id}`, { name: 'Renamed axis', tags: ['Elbow', 'bench 2', 'elbow'] }));
    expect(renamed).toMatchObject({ name: 'Renamed axis', revision: 2, tags: ['bench 2', 'elbow'], scenario: { name: 'Renamed axis' } });
    expect((await as('engineer').patch(`/api/scenarios/${id}`, {})).status).toBe(400);
    expect((await as('engineer').patch(`/api/scenarios/${id}`, { tags: ['<script>'] })).status).toBe(400);

    expect(await readJson(await as('engineer').post(`/api/scenarios/${id}/archive`))).toMatchObject({ status: 'archived', access: { edit: false } });
    const inList = async (query: string) => (await readJson(await as('viewer').get(`/api/scenarios?${query}`))).items.map((i: { id: number }) => i.id);
    expect(await inList('')).not.toContain(id);
    expect(await inList('status=archived')).toContain(id);
    const locked = await as('engineer').put(`/api/scenarios/${id}`, { scenario: { ...wrist, name: 'Renamed axis' }, baseRevision: 2 });
    expect(locked.status).toBe(409);
    expect((await readJson(locked)).error.code).toBe('archived');
    expect((await as('admin').post(`/api/scenarios/${id}/unarchive`)).status).toBe(200);
    expect(await inList('')).toContain(id);
  });

  it('searches names and notes, filters by tag, owner and status, sorts and paginates', async () => {
    await create('Search alpha', { notes: 'harmonic drive with backlash' }, 'admin');
    await create('Search beta 50%', {}, 'admin');
    const page = async (query: string) => readJson(await as('viewer').get(`/api/scenarios?${query}`));
    expect((await page('q=backlash')).items.map((i: { name: string }) => i.name)).toEqual(['Search alpha']);
    expect((await page('q=50%25')).items.map((i: { name: string }) => i.name)).toEqual(['Search beta 50%']);
    expect((await page('q=%25')).items.map((i: { name: string }) => i.name)).toEqual(['Search beta 50%']);
    expect((await page('tag=elbow')).items.map((i: { name: string }) => i.name)).toEqual(['Renamed axis']);
    const byAdmin = await page(`owner=${team.members.admin.id}&sort=name&order=desc`);
    expect(byAdmin.items.map((i: { name: string }) => i.name)).toEqual(['Search beta 50%', 'Search alpha']);
    expect((await page('status=signed-off')).items.map((i: { name: string }) => i.name)).toEqual([]);

    const all = await page('sort=name&pageSize=100');
    const names = all.items.map((i: { name: string }) => i.name);
    expect(names).toEqual([...names].sort((a: string, b: string) => a.toLowerCase().localeCompare(b.toLowerCase())));
    const second = await page('sort=name&pageSize=2&page=2');
    expect(second).toMatchObject({ page: 2, pageSize: 2, total: all.total });
    expect(second.items.map((i: { name: string }) => i.name)).toEqual(names.slice(2, 4));
    expect(all.items[0]).toEqual({
      id: expect.any(Number),
      name: expect.any(String),
      ownerName: expect.any(String),
      ownerId: expect.any(Number),
      updatedAt: expect.any(String),
      lastChangedBy: expect.any(String),
      status: expect.stringMatching(/^(draft|signed-off)$/),
      tags: expect.any(Array),
      revision: expect.any(Number),
    });
  });

  it.each([
    ['page=0', 'page'],
    ['pageSize=101', 'pageSize'],
    ['sort=colour', 'sort'],
    ['order=sideways', 'order'],
    ['status=deleted', 'status'],
    ['owner=abc', 'owner'],
    ['tag=a&tag=b', 'tag'],
    ['limit=5', ''],
    [`q=${'x'.repeat(201)}`, 'q'],
  ])('refuses the library query %s with 400 naming the parameter', async (query, field) => {
    const res = await as('viewer').get(`/api/scenarios?${query}`);
    expect(res.status).toBe(400);
    const body = await readJson(res);
    expect(body.error.fields.map((f: { field: string }) => f.field)).toContain(field);
  });

  it('refuses bad saves with field errors and loses nothing', async () => {
    const { id } = await create('Guarded axis');
    const cases: [unknown, number, string][] = [
      [{ scenario: { ...wrist, joint: { inertia: -1, damping: 0, stiffness: 0 } }, baseRevision: 1 }, 400, 'scenario.joint.inertia'],
      [{ scenario: wrist, baseRevision: 1, note: 'n'.repeat(MAX_REVISION_NOTE_LENGTH + 1) }, 400, 'note'],
      [{ scenario: wrist }, 400, 'baseRevision'],
      [{ scenario: wrist, baseRevision: 1, owner: 3 }, 400, ''],
      [{ baseRevision: 1 }, 400, 'scenario'],
    ];
    for (const [body, status, field] of cases) {
      const res = await as('engineer').put(`/api/scenarios/${id}`, body);
      expect(res.status, JSON.stringify(body).slice(0, 80)).toBe(status);
      expect((await readJson(res)).error.fields.map((f: { field: string }) => f.field)).toContain(field);
    }
    const huge = await as('engineer').put(`/api/scenarios/${id}`, { scenario: wrist, baseRevision: 1, note: 'x'.repeat(300_000) });
    expect(huge.status).toBe(413);
    expect((await as('engineer').put('/api/scenarios/987654', { scenario: wrist, baseRevision: 1 })).status).toBe(404);
    expect((await as('engineer').put('/api/scenarios/-1', { scenario: wrist, baseRevision: 1 })).status).toBe(400);
    expect(await readJson(await as('engineer').get(`/api/scenarios/${id}`))).toMatchObject({ revision: 1 });
  });

  it('exports our JSON with the safety caution and imports it back; a bad file gets field errors', async () => {
    const { id } = await create('Export axis');
    const res = await as('viewer').get(`/api/scenarios/${id}/export`);
    expect(res.status).toBe(200);
    expect(res.headers.get(SAFETY_CAUTION_HEADER)).toBe(SAFETY_CAUTION);
    expect(res.headers.get('content-disposition')).toBe('attachment; filename="Export-axis-r1.json"');
    const text = await res.text();
    // The caution is in the file itself, not only in the header.
    expect(JSON.parse(text).safetyCaution).toBe(SAFETY_CAUTION);
    const parsed = parseScenarioText(text);
    expect(parsed.ok && parsed.value.name).toBe('Export axis');
    const imported = await as('engineer').post('/api/scenarios/import', { file: JSON.parse(text), tags: ['imported'] });
    expect(imported.status).toBe(201);
    expect(await readJson(imported)).toMatchObject({ name: 'Export axis', revision: 1, tags: ['imported'] });

    const bad = await as('engineer').post('/api/scenarios/import', { file: { kind: 'something-else', version: 1 } });
    expect(bad.status).toBe(400);
    expect((await readJson(bad)).error.fields.map((f: { field: string }) => f.field)).toEqual(expect.arrayContaining(['file.kind', 'file.joint']));
    expect((await as('viewer').post('/api/scenarios/import', { file: JSON.parse(text) })).status).toBe(403);
    expect((await as('viewer').get(`/api/scenarios/${id}/export?revision=7`)).status).toBe(404);
  });
});
