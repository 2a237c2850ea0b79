import type pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createThrowawayCluster, type ThrowawayCluster } from '../testing/throwaway-cluster';
import { runMain } from '../testing/run-main';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestServer } from '../testing/test-server';
import { APP_GRANTS, MIGRATIONS_SCHEMA, MIGRATIONS_TABLE } from './app-grants';
import { readServingRoleFacts, servingRoleRefusal } from './app-role-check';

/**
 * Runs one statement as `pool`'s role inside a transaction that is always rolled back, and says
 * what PostgreSQL answered: 'accepted' or its error message. Nothing a test tries here stays.
 */
async function attempt(pool: pg.Pool, statement: string, params: unknown[] = []): Promise<string> {
  const client = await pool.connect();
  try {
    await client.query('BEGIN');
    return await client.query(statement, params).then(
      () => 'accepted',
      (err: Error) => err.message,
    );
  } finally {
    await client.query('ROLLBACK').catch(() => {});
    client.release();
  }
}

describe('the app role, as the server connects', () => {
  let t: TestServer;
  let app: pg.Pool;
  let ownerRole: string;
  let appRole: string;
  let signedOffScenario: number;
  let team: Awaited<ReturnType<typeof createTestTeam>>;

  beforeAll(async () => {
    t = await startTestServer();
    app = t.appDatabase.pool;
    appRole = (await app.query<{ r: string }>('SELECT current_user AS r')).rows[0]!.r;
    ownerRole = (await t.database.pool.query<{ r: string }>('SELECT current_user AS r')).rows[0]!.r;
    // A scenario whose head revision is signed off: the record the grants must protect.
    team = await createTestTeam(t, 'Roles lab');
    const created = await readJson(await team.members.engineer.api.post('/api/scenarios', { scenario: { ...demoScenarioDocument(), name: 'Signed axis' } }));
    signedOffScenario = created.id;
    const signed = await team.members.lead.api.post(`/api/scenarios/${created.id}/revisions/1/sign-off`, { acknowledgeSafety: true, note: 'reviewed' });
    expect(signed.status).toBe(200);
  });
  afterAll(() => t.close());

  it('is not a superuser, may not create roles or databases, owns nothing and is not the owner', async () => {
    const { rows } = await app.query('SELECT rolsuper, rolcreaterole, rolcreatedb, rolbypassrls FROM pg_roles WHERE rolname = current_user');
    expect(rows[0]).toEqual({ rolsuper: false, rolcreaterole: false, rolcreatedb: false, rolbypassrls: false });
    expect(appRole).not.toBe(ownerRole);
    const facts = await readServingRoleFacts(app);
    expect(facts).toMatchObject({ ownsDatabase: false, ownedSchemas: [], ownedRelations: [], mayCreate: false });
    expect(servingRoleRefusal(facts)).toBeNull();
  });

  it('cannot disable, drop or replace the revisions immutability trigger', async () => {
    expect(await attempt(app, 'ALTER TABLE scenario_revisions DISABLE TRIGGER ALL')).toMatch(/must be owner of table scenario_revisions/);
    expect(await attempt(app, 'ALTER TABLE scenario_revisions DISABLE TRIGGER scenario_revisions_immutable')).toMatch(/must be owner/);
    expect(await attempt(app, 'DROP TRIGGER scenario_revisions_immutable ON scenario_revisions')).toMatch(/must be owner/);
    expect(await attempt(app, 'CREATE OR REPLACE FUNCTION scenario_revisions_immutable() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN RETURN NEW; END $$')).toMatch(
      /must be owner of function|permission denied/,
    );
    expect(await attempt(app, 'ALTER TABLE scenario_revisions OWNER TO CURRENT_USER')).toMatch(/must be owner/);
    expect(await attempt(app, "SET session_replication_role = 'replica'")).toMatch(/permission denied/);
  });

  it('cannot TRUNCATE any table', async () => {
    const { rows } = await t.database.pool.query<{ name: string }>(
      `SELECT format('%I.%I', schemaname, tablename) AS name FROM pg_tables WHERE schemaname IN ('public', $1) ORDER BY 1`,
      [MIGRATIONS_SCHEMA],
    );
    expect(rows.length).toBeGreaterThan(APP_GRANTS.length);
    for (const { name } of rows) expect(await attempt(app, `TRUNCATE ${name}`), name).toMatch(/permission denied for table/);
  });

  it('cannot change or delete a revision beyond its sign-off columns', async () => {
    const where = `WHERE scenario_id = ${signedOffScenario} AND number = 1`;
    for (const set of ["document = '{}'::jsonb", 'number = 7', "note = 'rewritten'", 'author_id = author_id', 'created_at = now()', 'scenario_id = scenario_id']) {
      expect(await attempt(app, `UPDATE scenario_revisions SET ${set} ${where}`), set).toMatch(/permission denied for table scenario_revisions/);
    }
    expect(await attempt(app, `DELETE FROM scenario_revisions ${where}`)).toMatch(/permission denied for table scenario_revisions/);
    // The sign-off columns it may write, and the trigger still guards a signed-off revision's.
    expect(await attempt(app, `UPDATE scenario_revisions SET sign_off_note = 'changed' ${where}`)).toMatch(/signed off and immutable/);
  });

  it('signs off an unsigned revision through its column grant', async () => {
    const { rows } = await app.query<{ id: number; author: number }>('SELECT id, author_id AS author FROM scenario_revisions WHERE signed_off_at IS NULL ORDER BY id LIMIT 1');
    expect(await attempt(app, 'UPDATE scenario_revisions SET signed_off_by = $1, signed_off_at = now(), sign_off_note = $2 WHERE id = $3', [rows[0]!.author, 'probe', rows[0]!.id])).toBe('accepted');
  });

  it('cannot delete what the code never deletes', async () => {
    for (const grant of APP_GRANTS.filter((g) => !g.privileges.includes('DELETE'))) {
      expect(await attempt(app, `DELETE FROM ${grant.table} WHERE false`), grant.table).toMatch(/permission denied/);
    }
  });

  it('runs no DDL: no table, schema, column or trigger of its own, and no drop', async () => {
    expect(await attempt(app, 'CREATE TABLE public.probe (id int)')).toMatch(/permission denied for schema public/);
    expect(await attempt(app, 'CREATE SCHEMA probe')).toMatch(/permission denied for database/);
    expect(await attempt(app, 'DROP TABLE scenarios')).toMatch(/must be owner of table scenarios/);
    expect(await attempt(app, 'ALTER TABLE scenarios ADD COLUMN document jsonb')).toMatch(/must be owner of table scenarios/);
    expect(await attempt(app, 'CREATE INDEX probe_idx ON scenarios (name)')).toMatch(/must be owner of table scenarios/);
    expect(await attempt(app, 'CREATE TRIGGER probe BEFORE INSERT ON scenarios FOR EACH ROW EXECUTE FUNCTION scenario_revisions_immutable()')).toMatch(/permission denied/);
    expect(await attempt(app, `INSERT INTO ${MIGRATIONS_SCHEMA}.${MIGRATIONS_TABLE} (hash, created_at) VALUES ('x', 0)`)).toMatch(/permission denied/);
  });

  it('cannot raise its own rights or become the owner', async () => {
    expect(await attempt(app, `ALTER ROLE ${appRole} SUPERUSER`)).toMatch(/permission denied|must be superuser/);
    expect(await attempt(app, 'ALTER ROLE CURRENT_USER CREATEROLE')).toMatch(/permission denied|must be superuser/);
    expect(await attempt(app, 'CREATE ROLE probe')).toMatch(/permission denied/);
    expect(await attempt(app, `SET ROLE ${ownerRole}`)).toMatch(/permission denied to set role/);
    expect(await attempt(app, `GRANT ${ownerRole} TO ${appRole}`)).toMatch(/permission denied|must have admin option/);
    expect(await attempt(app, 'GRANT TRUNCATE ON scenarios TO CURRENT_USER')).toBe('accepted'); // only a warning: it held no grant option
    expect((await app.query("SELECT has_table_privilege('scenarios', 'TRUNCATE') AS may")).rows[0].may).toBe(false);
  });

  it('holds exactly the privileges app-grants.ts lists, table by table and column by column', async () => {
    for (const grant of APP_GRANTS) {
      for (const privilege of ['SELECT', 'INSERT', 'UPDATE', 'DELETE', 'TRUNCATE', 'REFERENCES', 'TRIGGER']) {
        const { rows } = await app.query('SELECT has_table_privilege($1, $2) AS may', [`public.${grant.table}`, privilege]);
        expect(rows[0].may, `${privilege} on ${grant.table}`).toBe((grant.privileges as readonly string[]).includes(privilege));
      }
      const { rows: columns } = await app.query<{ name: string; may: boolean }>(
        `SELECT attname AS name, has_column_privilege($1::regclass, attnum, 'UPDATE') AS may FROM pg_attribute WHERE attrelid = $1::regclass AND attnum > 0 AND NOT attisdropped`,
        [`public.${grant.table}`],
      );
      for (const column of columns) {
        const expected = grant.privileges.includes('UPDATE') || (grant.updateColumns ?? []).includes(column.name);
        expect(column.may, `UPDATE of ${grant.table}.${column.name}`).toBe(expected);
      }
    }
  });

  it('shows the head revision’s own document: the scenario row keeps no copy to change', async () => {
    const { rows } = await t.database.pool.query("SELECT 1 FROM information_schema.columns WHERE table_name = 'scenarios' AND column_name = 'document'");
    expect(rows).toHaveLength(0);
    const detail = await readJson(await team.members.viewer.api.get(`/api/scenarios/${signedOffScenario}`));
    const revision = await readJson(await team.members.viewer.api.get(`/api/scenarios/${signedOffScenario}/revisions/1`));
    expect(detail).toMatchObject({ status: 'signed-off', revision: 1 });
    expect(detail.scenario).toEqual(revision.scenario);
    expect(detail.scenario.controller).toEqual(demoScenarioDocument().controller);
  });
});

describe('the start-up check of the serving role', () => {
  let cluster: ThrowawayCluster;

  beforeAll(async () => {
    cluster = await createThrowawayCluster();
  }, 90_000);
  afterAll(() => cluster?.destroy());

  const once = (env: Record<string, string | undefined>) => runMain({ PORT: '0', KINETWIN_MODE: 'demo', ...env });

  it('refuses a superuser as the serving role in one line, and serves once it is the app role', { timeout: 120_000 }, async () => {
    const superuser = await once({ DATABASE_URL: cluster.superuserUrl, DATABASE_OWNER_URL: cluster.ownerUrl });
    expect(superuser.code).toBe(1);
    expect(superuser.stderr.trim().split('\n')).toHaveLength(1);
    expect(superuser.stderr).toMatch(/^kinetwin: the database role kinetwin \(DATABASE_URL\) is a superuser, .*ALLOW_PRIVILEGED_DATABASE_ROLE=true/);
    expect(superuser.stdout).not.toContain('is up:');

    // The owner serving alone: it owns the tables, so the same refusal, naming what it owns.
    const owner = await once({ DATABASE_URL: cluster.ownerUrl, DATABASE_OWNER_URL: undefined });
    expect(owner.code).toBe(1);
    expect(owner.stderr.trim().split('\n')).toHaveLength(1);
    expect(owner.stderr).toMatch(/the database role kinetwin_owner \(DATABASE_URL\) owns the database, owns the schemas drizzle, public, owns \d+ tables/);

    // The explicit opt-out serves anyway.
    const optedOut = await once({ DATABASE_URL: cluster.superuserUrl, DATABASE_OWNER_URL: cluster.ownerUrl, ALLOW_PRIVILEGED_DATABASE_ROLE: 'true' });
    expect(optedOut.stdout).toMatch(/is up:/);
    expect(optedOut.code).toBe(0);

    // The app role alone, after the owner migrated and granted: nothing to migrate, it serves.
    const grants = await once({ DATABASE_URL: cluster.url, DATABASE_OWNER_URL: cluster.ownerUrl });
    expect(grants.stdout).toMatch(/is up:/);
    const alone = await once({ DATABASE_URL: cluster.url, DATABASE_OWNER_URL: undefined });
    expect(alone.stderr).toBe('');
    expect(alone.stdout).toMatch(/is up:/);
    expect(alone.code).toBe(0);
  });
});
