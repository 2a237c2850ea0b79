import type pg from 'pg';
import { APP_GRANTS, MIGRATIONS_SCHEMA, MIGRATIONS_TABLE } from './app-grants';

/** An SQL identifier, quoted (role and table names are never spliced in bare). */
export function quoteIdentifier(name: string): string {
  return `"${name.replace(/"/g, '""')}"`;
}

/** Serialises grant changes of servers starting together (GRANT races fail with "tuple concurrently updated"). */
const GRANTS_LOCK = 7314002;

/**
 * Makes the app role's privileges exactly APP_GRANTS, run as the owner of the tables: every
 * privilege on the public schema's tables and sequences is revoked first (column privileges go
 * with them), then the list is granted, with USAGE on the serial sequences of tables it may
 * insert into, and SELECT on the migrator's bookkeeping. One transaction: a failure leaves the
 * previous grants as they were.
 */
export async function applyAppGrants(ownerPool: pg.Pool, appRole: string): Promise<void> {
  const role = quoteIdentifier(appRole);
  const client = await ownerPool.connect();
  try {
    await client.query('BEGIN');
    await client.query('SELECT pg_advisory_xact_lock($1)', [GRANTS_LOCK]);
    await client.query(`REVOKE ALL ON ALL TABLES IN SCHEMA public FROM ${role}`);
    await client.query(`REVOKE ALL ON ALL SEQUENCES IN SCHEMA public FROM ${role}`);
    await client.query(`GRANT USAGE ON SCHEMA public TO ${role}`);
    for (const grant of APP_GRANTS) {
      const table = `public.${quoteIdentifier(grant.table)}`;
      if (grant.privileges.length > 0) await client.query(`GRANT ${grant.privileges.join(', ')} ON TABLE ${table} TO ${role}`);
      if (grant.updateColumns?.length) {
        await client.query(`GRANT UPDATE (${grant.updateColumns.map(quoteIdentifier).join(', ')}) ON TABLE ${table} TO ${role}`);
      }
      if (grant.privileges.includes('INSERT')) {
        // The sequences behind the table's serial columns (owned by the table, 'a'uto dependency).
        const { rows } = await client.query<{ sequence: string }>(
          `SELECT s.oid::regclass::text AS sequence FROM pg_class s
             JOIN pg_depend d ON d.classid = 'pg_class'::regclass AND d.objid = s.oid AND d.deptype = 'a'
            WHERE s.relkind = 'S' AND d.refobjid = $1::regclass`,
          [table],
        );
        for (const { sequence } of rows) await client.query(`GRANT USAGE ON SEQUENCE ${sequence} TO ${role}`);
      }
    }
    const schema = quoteIdentifier(MIGRATIONS_SCHEMA);
    await client.query(`REVOKE ALL ON ALL TABLES IN SCHEMA ${schema} FROM ${role}`);
    await client.query(`GRANT USAGE ON SCHEMA ${schema} TO ${role}`);
    await client.query(`GRANT SELECT ON TABLE ${schema}.${quoteIdentifier(MIGRATIONS_TABLE)} TO ${role}`);
    await client.query('COMMIT');
  } catch (err) {
    await client.query('ROLLBACK').catch(() => {});
    throw err;
  } finally {
    client.release();
  }
}
