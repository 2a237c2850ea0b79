import { readdirSync } from 'node:fs';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { scenarioRevisions, scenarios, teams, users } from '../../drizzle/schema';
import { DEMO_ACCOUNTS, seedDemo } from '../db/seed-demo';
import { runMigrations } from '../db/migrate';
import { readJson, signIn, startTestServer, type TestServer } from '../testing/test-server';

const demoFiles = readdirSync(new URL('../../scenarios', import.meta.url)).filter((f) => f.endsWith('.json'));

describe('scenario library against the real database', () => {
  let t: TestServer;
  let cookie: string;
  let foreignScenarioId: number;

  beforeAll(async () => {
    t = await startTestServer();
    cookie = await signIn(t.baseUrl, DEMO_ACCOUNTS[0]!.email, DEMO_ACCOUNTS[0]!.password);
    // Another team with a scenario of its own, which the demo team must never see.
    const db = t.database.db;
    const [team] = await db.insert(teams).values({ name: 'Other lab' }).returning();
    const [owner] = await db
      .insert(users)
      .values({ teamId: team!.id, email: `other-${Date.now()}@example.test`, displayName: 'Other owner', passwordHash: 'x' })
      .returning();
    const [row] = await db.insert(scenarios).values({ teamId: team!.id, ownerId: owner!.id, name: 'Other lab secret axis', headRevision: 1 }).returning();
    await db.insert(scenarioRevisions).values({ scenarioId: row!.id, number: 1, document: { kind: 'kinetwin/scenario' }, authorId: owner!.id });
    foreignScenarioId = row!.id;
  });
  afterAll(() => t.close());

  const get = (path: string, withCookie = true) => fetch(`${t.baseUrl}${path}`, { headers: withCookie ? { cookie } : {} });

  it('lists every demo scenario with its owner and update time, and nothing of another team', async () => {
    const res = await get('/api/scenarios');
    expect(res.status).toBe(200);
    const { items } = await readJson(res);
    expect(items).toHaveLength(demoFiles.length);
    for (const item of items) {
      expect(item).toMatchObject({ id: expect.any(Number), name: expect.any(String), ownerName: DEMO_ACCOUNTS[0]!.displayName, updatedAt: expect.any(String) });
      expect(Number.isNaN(Date.parse(item.updatedAt))).toBe(false);
    }
    expect(items.map((i: { name: string }) => i.name)).not.toContain('Other lab secret axis');
  });

  it('returns one scenario with its validated document', async () => {
    const { items } = await (await readJson(await get('/api/scenarios')));
    const res = await get(`/api/scenarios/${items[0].id}`);
    expect(res.status).toBe(200);
    const detail = await readJson(res);
    expect(detail.scenario).toMatchObject({ kind: 'kinetwin/scenario', version: 1, name: items[0].name });
  });

  it.each([
    ['abc', 400],
    ['1.5', 400],
    ['-3', 400],
    ['99999999999', 400],
    ['987654', 404],
  ])('answers /api/scenarios/%s with %i and a message', async (id, status) => {
    const res = await get(`/api/scenarios/${id}`);
    expect(res.status).toBe(status);
    expect((await readJson(res)).error.message).toEqual(expect.any(String));
  });

  it("hides another team's scenario as not found", async () => {
    const res = await get(`/api/scenarios/${foreignScenarioId}`);
    expect(res.status).toBe(404);
    expect(JSON.stringify(await readJson(res))).not.toContain('Other lab');
  });

  it('needs a session', async () => {
    expect((await get('/api/scenarios', false)).status).toBe(401);
    expect((await get('/api/scenarios/1', false)).status).toBe(401);
  });

  it('migrates and seeds idempotently', async () => {
    const db = t.database.db;
    const before = await db.select().from(scenarios).where(eq(scenarios.teamId, (await db.select().from(users).where(eq(users.email, DEMO_ACCOUNTS[0]!.email)))[0]!.teamId));
    await runMigrations(db);
    const second = await seedDemo(db);
    expect(second).toEqual({ users: DEMO_ACCOUNTS.length, scenarios: demoFiles.length });
    const after = await db.select().from(scenarios).where(eq(scenarios.teamId, before[0]!.teamId));
    expect(after.map((r) => [r.id, r.updatedAt.toISOString()])).toEqual(before.map((r) => [r.id, r.updatedAt.toISOString()]));
  });

  it('reports health with the database answering', async () => {
    const res = await get('/api/health', false);
    expect(res.status).toBe(200);
    expect(await readJson(res)).toMatchObject({ status: 'ok', version: 'test', database: { ok: true } });
  });

  it('answers unknown API paths with a JSON 404', async () => {
    const res = await get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect((await readJson(res)).error.code).toBe('not_found');
  });
});
