/**
 * Everything the server's own database role (DATABASE_URL) may do, table by table: the one place
 * these grants live. The owner role applies them after migrating (applyAppGrants); anything not
 * listed is revoked, so a privilege dropped here is gone at the next start. Never listed, on any
 * table: TRUNCATE, REFERENCES, TRIGGER, and DDL (the app role owns nothing, so it cannot ALTER,
 * DROP or disable a trigger). A new table needs an entry, or app-grants.spec.ts fails.
 *
 * UPDATE is by column where the code changes only some columns; SELECT … FOR UPDATE needs UPDATE
 * on at least one column, INSERT … ON CONFLICT DO UPDATE on the columns it sets.
 */
export interface TableGrant {
  table: string;
  /** Table-wide privileges. */
  privileges: readonly ('SELECT' | 'INSERT' | 'UPDATE' | 'DELETE')[];
  /** UPDATE of these columns only (then `privileges` holds no UPDATE). */
  updateColumns?: readonly string[];
  /** Which code needs it. */
  why: string;
}

export const APP_GRANTS: readonly TableGrant[] = [
  { table: 'teams', privileges: ['SELECT', 'INSERT'], why: 'sign-up makes a team (auth/account-store.ts); the seed makes the demo team' },
  {
    table: 'users',
    privileges: ['SELECT', 'INSERT'],
    updateColumns: ['password_hash', 'role', 'display_name', 'session_generation', 'deactivated_at'],
    why: 'sign-up and invitations add members; a rehash at sign-in (auth/user-store.ts), a reset, a role change, sign-out everywhere and removal change these columns; the seed resets demo users',
  },
  {
    table: 'scenarios',
    privileges: ['SELECT', 'INSERT'],
    updateColumns: ['name', 'head_revision', 'updated_at', 'tags', 'archived_at'],
    why: 'saves move the head (scenarios/revision-store.ts, locked FOR UPDATE), tags and archive (scenario-routes.ts); no DELETE: scenarios are archived',
  },
  {
    table: 'scenario_revisions',
    privileges: ['SELECT', 'INSERT'],
    updateColumns: ['signed_off_by', 'signed_off_at', 'sign_off_note'],
    why: 'revisions are appended, never changed or deleted; only sign-off fills its columns (revision-routes.ts), and the immutability trigger refuses even that once signed',
  },
  {
    table: 'invitations',
    privileges: ['SELECT', 'INSERT'],
    updateColumns: ['accepted_at', 'revoked_at'],
    why: 'admins invite and revoke (team/team-routes.ts); accepting marks it (auth/account-store.ts)',
  },
  { table: 'password_resets', privileges: ['SELECT', 'INSERT'], updateColumns: ['used_at'], why: 'reset links are issued and used once (auth/password-reset-routes.ts)' },
  {
    table: 'handoffs',
    privileges: ['SELECT', 'INSERT'],
    updateColumns: ['from_user_id', 'access', 'message', 'revision_number', 'created_at'],
    why: 'handing a scenario again to the same person replaces the row (library/handoff-routes.ts, ON CONFLICT DO UPDATE)',
  },
  { table: 'comments', privileges: ['SELECT', 'INSERT'], why: 'comments and replies are added and listed (library/comment-routes.ts)' },
  { table: 'activity', privileges: ['SELECT', 'INSERT'], why: 'the activity log is appended and read (library/activity-log.ts)' },
  {
    table: 'joint_logs',
    privileges: ['SELECT', 'INSERT', 'DELETE'],
    updateColumns: ['fit_report'],
    why: 'logged traces are saved, listed, downloaded and deleted by their owner (logs/joint-log-store.ts); a fit stores its report on the log',
  },
  {
    table: 'joint_log_signals',
    privileges: ['SELECT', 'INSERT', 'DELETE'],
    why: "a log's samples are written once per signal and read back (logs/joint-log-store.ts); deleting a log removes them (ON DELETE CASCADE)",
  },
  { table: 'outbox', privileges: ['SELECT', 'INSERT'], why: 'the outbox transport writes mail, the dev mailbox reads it (mail/outbox-transport.ts, mailbox-routes.ts)' },
  {
    table: 'session',
    privileges: ['SELECT', 'INSERT', 'UPDATE', 'DELETE'],
    why: 'connect-pg-simple reads, upserts, touches, destroys and prunes sessions; session-revocation.ts reads them',
  },
  {
    table: 'sign_in_limits',
    privileges: ['SELECT', 'INSERT', 'UPDATE', 'DELETE'],
    why: 'rate-limiter-flexible RateLimiterPostgres upserts counters, reads them, deletes on success and clears expired rows (auth/sign-in-limits.ts)',
  },
];

/** The migrator's bookkeeping, readable so a server without the owner URL can tell nothing is pending. */
export const MIGRATIONS_SCHEMA = 'drizzle';
export const MIGRATIONS_TABLE = '__drizzle_migrations';
