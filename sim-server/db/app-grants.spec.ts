import { is } from 'drizzle-orm';
import { getTableConfig, PgTable } from 'drizzle-orm/pg-core';
import { describe, expect, it } from 'vitest';
import * as schema from '../../drizzle/schema';
import { APP_GRANTS } from './app-grants';

const tables = (Object.values(schema) as unknown[]).filter((value): value is PgTable => is(value, PgTable)).map((table) => getTableConfig(table));

describe('the app role grants', () => {
  it('name every table of drizzle/schema.ts once, and no other', () => {
    const granted = APP_GRANTS.map((g) => g.table);
    expect(new Set(granted).size).toBe(granted.length);
    expect([...granted].sort()).toEqual(tables.map((t) => t.name).sort());
  });

  it('name only columns the tables have, with UPDATE either table-wide or by column', () => {
    for (const grant of APP_GRANTS) {
      const columns = tables.find((t) => t.name === grant.table)!.columns.map((c) => c.name);
      for (const column of grant.updateColumns ?? []) expect(columns, `${grant.table}.${column}`).toContain(column);
      if (grant.updateColumns) expect(grant.privileges, grant.table).not.toContain('UPDATE');
      expect(grant.why.length, grant.table).toBeGreaterThan(10);
    }
  });

  it('hold no privilege outside SELECT, INSERT, UPDATE and DELETE (no TRUNCATE, REFERENCES or TRIGGER)', () => {
    for (const grant of APP_GRANTS) for (const p of grant.privileges) expect(['SELECT', 'INSERT', 'UPDATE', 'DELETE']).toContain(p);
  });

  it('let revisions only be read, appended and signed off', () => {
    const revisions = APP_GRANTS.find((g) => g.table === 'scenario_revisions')!;
    expect(revisions.privileges).toEqual(['SELECT', 'INSERT']);
    expect([...revisions.updateColumns!].sort()).toEqual(['sign_off_note', 'signed_off_at', 'signed_off_by']);
  });

  it('let nothing but sessions, sign-in counters and logged traces (their owner deletes them) be deleted', () => {
    expect(APP_GRANTS.filter((g) => g.privileges.includes('DELETE')).map((g) => g.table).sort()).toEqual(['joint_log_signals', 'joint_logs', 'session', 'sign_in_limits']);
  });
});
