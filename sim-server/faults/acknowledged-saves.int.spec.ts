import { and, eq, inArray, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { scenarioRevisions, scenarios, teams, users } from '../../drizzle/schema';
import { hashPassword } from '../auth/passwords';
import { readConfig } from '../config';
import { openDatabase, type DatabaseHandle } from '../db/database';
import { runMigrations } from '../db/migrate';
import { startServerProcess, type ServerProcess } from '../testing/server-process';
import { apiClient, demoScenarioDocument, readJson, signInSession, type ApiClient, type TestSession } from '../testing/test-server';

/** Saves in flight at once: one chain per scenario, each save on top of the one before it. */
const CONCURRENT_SAVES = 100;
/** The server is killed once this many saves were acknowledged, with about CONCURRENT_SAVES more in flight. */
const KILL_AFTER_ACKS = 150;
const SECRET = { SESSION_SECRET: 'acknowledged-saves-test-secret' };

interface Acknowledged {
  scenarioId: number;
  revision: number;
  note: string;
  name: string;
}

describe('a save answered 2xx survives SIGKILL of the server', () => {
  let database: DatabaseHandle;
  let server: ServerProcess | null = null;
  let session: TestSession;
  let ownerId: number;
  const password = 'acknowledged-saves-password-3';

  beforeAll(async () => {
    const read = readConfig(process.env);
    if (!read.ok) throw new Error(read.message);
    // The owner's handle: the fixtures below are written straight to the tables.
    database = openDatabase(read.config.databaseOwnerUrl ?? read.config.databaseUrl);
    await runMigrations(database.db);
    // A team of its own, so the library tests of other files see none of these scenarios.
    const [team] = await database.db.insert(teams).values({ name: 'Durability lab' }).returning({ id: teams.id });
    const email = `engineer.durability-${team!.id}@example.test`;
    const [user] = await database.db
      .insert(users)
      .values({ teamId: team!.id, email, displayName: 'Durability engineer', role: 'engineer', passwordHash: await hashPassword(password) })
      .returning({ id: users.id });
    ownerId = user!.id;
    server = await startServerProcess(SECRET);
    session = await signInSession(server.baseUrl, email, password);
  }, 90_000);
  afterAll(async () => {
    await server?.kill('SIGTERM');
    await database?.close();
  });

  it('keeps every acknowledged revision, and no head points at a missing one', { timeout: 180_000 }, async () => {
    const api: ApiClient = apiClient(server!.baseUrl, session);
    const wrist = demoScenarioDocument();
    const ids: number[] = [];
    for (let batch = 0; batch < CONCURRENT_SAVES; batch += 10) {
      const created = await Promise.all(
        Array.from({ length: 10 }, async (_, i) => {
          const res = await api.post('/api/scenarios', { scenario: { ...wrist, name: `Durability ${batch + i}` } });
          expect(res.status).toBe(201);
          return (await readJson(res)).id as number;
        }),
      );
      ids.push(...created);
    }

    const acknowledged: Acknowledged[] = [];
    let killed: Promise<void> | null = null;
    let inFlightAtKill = 0;
    let inFlight = 0;
    const chain = async (scenarioId: number) => {
      let base = 1;
      for (let k = 1; killed === null; k++) {
        const name = `Durability ${scenarioId} save ${k}`;
        const note = `save ${k} of scenario ${scenarioId}`;
        inFlight++;
        const res = await api.put(`/api/scenarios/${scenarioId}`, { scenario: { ...wrist, name }, baseRevision: base, note }).catch(() => null);
        inFlight--;
        if (res === null) return; // the connection died with the server: no answer, no promise made
        if (res.status < 200 || res.status >= 300) throw new Error(`save answered ${res.status}: ${await res.text()}`);
        // A 2xx status line is the promise, even when the kill cuts the body off: a save on top
        // of `base` can only have made revision base + 1.
        const revision = base + 1;
        acknowledged.push({ scenarioId, revision, note, name });
        if (acknowledged.length >= KILL_AFTER_ACKS && killed === null) {
          inFlightAtKill = inFlight;
          killed = server!.kill('SIGKILL');
        }
        const body = await readJson(res).catch(() => null);
        if (body !== null) expect(body.revision).toBe(revision);
        base = revision;
      }
    };
    await Promise.all(ids.map(chain));
    await killed;
    // Killed in the middle: saves were still waiting for their answer.
    expect(acknowledged.length).toBeGreaterThanOrEqual(KILL_AFTER_ACKS);
    expect(inFlightAtKill).toBeGreaterThan(0);

    server = await startServerProcess(SECRET);

    // Straight from the database: every acknowledged revision, with the document and note sent.
    const rows = await database.db
      .select({ scenarioId: scenarioRevisions.scenarioId, number: scenarioRevisions.number, note: scenarioRevisions.note, name: sql<string>`${scenarioRevisions.document}->>'name'` })
      .from(scenarioRevisions)
      .where(inArray(scenarioRevisions.scenarioId, ids));
    const stored = new Set(rows.map((r) => `${r.scenarioId}/${r.number}/${r.note}/${r.name}`));
    const missing = acknowledged.filter((a) => !stored.has(`${a.scenarioId}/${a.revision}/${a.note}/${a.name}`));
    expect(missing).toEqual([]);

    // No scenario anywhere has a head revision without its row. Head 0 is the schema's "no
    // revision yet", which only other tests' fixtures leave (rows inserted directly); the server
    // always writes revision 1 with the scenario, and our own scenarios are checked below.
    const dangling = await database.db.execute(sql`
      SELECT s.id, s.head_revision FROM ${scenarios} s
      LEFT JOIN ${scenarioRevisions} r ON r.scenario_id = s.id AND r.number = s.head_revision
      WHERE r.id IS NULL AND s.head_revision > 0`);
    expect(dangling.rows).toEqual([]);
    // Each scenario's head is at or past its last acknowledged save, and numbers have no gaps.
    const heads = await database.db.select({ id: scenarios.id, head: scenarios.headRevision }).from(scenarios).where(and(inArray(scenarios.id, ids), eq(scenarios.ownerId, ownerId)));
    for (const { id, head } of heads) {
      const lastAck = Math.max(1, ...acknowledged.filter((a) => a.scenarioId === id).map((a) => a.revision));
      expect(head, `scenario ${id}`).toBeGreaterThanOrEqual(lastAck);
      expect(rows.filter((r) => r.scenarioId === id).map((r) => r.number).sort((a, b) => a - b)).toEqual(Array.from({ length: head }, (_, i) => i + 1));
    }

    // And through the restarted server, with the session made before the kill.
    const after = apiClient(server.baseUrl, session);
    const sample = acknowledged.at(-1)!;
    const revision = await after.get(`/api/scenarios/${sample.scenarioId}/revisions/${sample.revision}`);
    expect(revision.status).toBe(200);
    expect(await readJson(revision)).toMatchObject({ number: sample.revision, note: sample.note, scenario: { name: sample.name } });
  });
});
