import type pg from 'pg';

/** What PostgreSQL says about the role a pool connects as, in the database it connects to. */
export interface ServingRoleFacts {
  role: string;
  superuser: boolean;
  createRole: boolean;
  createDatabase: boolean;
  bypassRowSecurity: boolean;
  /** Owns the database, or is a member of its owner (then it owns the public schema too, from PostgreSQL 15). */
  ownsDatabase: boolean;
  /** Schemas outside the system ones it owns or may act as the owner of (membership counts). */
  ownedSchemas: string[];
  /** Tables, views and sequences outside the system schemas it owns or may act as the owner of. */
  ownedRelations: string[];
  /** May create schemas in the database, or objects in the public schema. */
  mayCreate: boolean;
}

const SYSTEM_SCHEMA = `(n.nspname LIKE 'pg\\_%' OR n.nspname = 'information_schema')`;

export async function readServingRoleFacts(pool: pg.Pool): Promise<ServingRoleFacts> {
  const { rows } = await pool.query<ServingRoleFacts>(`
    SELECT r.rolname AS role, r.rolsuper AS superuser, r.rolcreaterole AS "createRole", r.rolcreatedb AS "createDatabase",
           r.rolbypassrls AS "bypassRowSecurity",
           pg_has_role(r.oid, d.datdba, 'MEMBER') AS "ownsDatabase",
           ARRAY(SELECT n.nspname::text FROM pg_namespace n
                  WHERE NOT ${SYSTEM_SCHEMA} AND pg_has_role(r.oid, n.nspowner, 'MEMBER') ORDER BY 1) AS "ownedSchemas",
           ARRAY(SELECT format('%I.%I', n.nspname, c.relname) FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
                  WHERE NOT ${SYSTEM_SCHEMA} AND c.relkind IN ('r', 'p', 'v', 'm', 'S', 'f')
                    AND pg_has_role(r.oid, c.relowner, 'MEMBER') ORDER BY 1) AS "ownedRelations",
           has_database_privilege(r.oid, d.oid, 'CREATE')
             OR coalesce(has_schema_privilege(r.oid, to_regnamespace('public'), 'CREATE'), false) AS "mayCreate"
      FROM pg_roles r, pg_database d
     WHERE r.rolname = current_user AND d.datname = current_database()`);
  return rows[0]!;
}

/** Names kept in the one-line refusal; the count says how many more there are. */
const LISTED = 3;

function some(names: string[]): string {
  const shown = names.slice(0, LISTED).join(', ');
  return names.length > LISTED ? `${shown} and ${names.length - LISTED} more` : shown;
}

/**
 * Why the server must not serve with this role, in one line, or null when it holds no more than
 * grants: a superuser or an owner can drop tables, disable the revisions' immutability trigger
 * and grant itself anything, and a role that may create roles can make itself a member of the
 * owner, so no grant would protect anything against a bug or an injection.
 */
export function servingRoleRefusal(facts: ServingRoleFacts): string | null {
  const problems: string[] = [];
  if (facts.superuser) problems.push('is a superuser');
  if (facts.createRole) problems.push('may create roles');
  if (facts.createDatabase) problems.push('may create databases');
  if (facts.bypassRowSecurity) problems.push('bypasses row security');
  if (facts.ownsDatabase) problems.push('owns the database');
  if (facts.ownedSchemas.length > 0) problems.push(`owns the schema${facts.ownedSchemas.length > 1 ? 's' : ''} ${some(facts.ownedSchemas)}`);
  if (facts.ownedRelations.length > 0) problems.push(`owns ${facts.ownedRelations.length} table${facts.ownedRelations.length > 1 ? 's' : ''} (${some(facts.ownedRelations)})`);
  if (facts.mayCreate && !facts.superuser && !facts.ownsDatabase) problems.push('may create schemas or tables');
  if (problems.length === 0) return null;
  return (
    `the database role ${facts.role} (DATABASE_URL) ${problems.join(', ')}: the server serves only with a role that owns nothing and holds only its grants. ` +
    'Set DATABASE_URL to that role and DATABASE_OWNER_URL to the owner (scripts/local-postgres.sh env prints both), or set ALLOW_PRIVILEGED_DATABASE_ROLE=true to serve anyway.'
  );
}
