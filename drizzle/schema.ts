import { sql } from 'drizzle-orm';
import { type AnyPgColumn, bigint, check, customType, index, integer, json, jsonb, pgEnum, pgTable, primaryKey, serial, text, timestamp, unique, varchar } from 'drizzle-orm/pg-core';
import { roles } from '../shared/protocol/api-types';
import { handoffAccesses } from '../shared/protocol/library-api';

export const roleEnum = pgEnum('role', roles);
export const handoffAccessEnum = pgEnum('handoff_access', handoffAccesses);

/** A team owns its members and its scenarios; nothing crosses between teams. */
export const teams = pgTable('teams', {
  id: serial('id').primaryKey(),
  name: text('name').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const users = pgTable('users', {
  id: serial('id').primaryKey(),
  teamId: integer('team_id')
    .notNull()
    .references(() => teams.id),
  /** Stored lower-cased so sign-in is case-insensitive. */
  email: varchar('email', { length: 254 }).notNull().unique(),
  displayName: text('display_name').notNull(),
  passwordHash: text('password_hash').notNull(),
  role: roleEnum('role').notNull().default('engineer'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  /** Stored in each session; raising it signs the user out everywhere. */
  sessionGeneration: integer('session_generation').notNull().default(0),
  /** Set when an admin removes the member: no sign-in, sessions end, authorship stays. */
  deactivatedAt: timestamp('deactivated_at', { withTimezone: true }),
});

export const scenarios = pgTable(
  'scenarios',
  {
    id: serial('id').primaryKey(),
    teamId: integer('team_id')
      .notNull()
      .references(() => teams.id),
    ownerId: integer('owner_id')
      .notNull()
      .references(() => users.id),
    name: text('name').notNull(),
    /** Set for the seeded demo scenarios, so the seed can update them in place. */
    demoKey: text('demo_key').unique(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    /**
     * Number of the newest revision, 0 before the first. The scenario's document is that
     * revision's: the row keeps no copy, so what was signed off is the only version there is.
     */
    headRevision: integer('head_revision').notNull().default(0),
    tags: text('tags').array().notNull().default(sql`'{}'::text[]`),
    /** Soft delete: set when archived, cleared when restored. */
    archivedAt: timestamp('archived_at', { withTimezone: true }),
  },
  (table) => [index('scenarios_team_idx').on(table.teamId)],
);

/** Every save of a scenario (the validated document of shared/scenario/scenario-schema.ts); append-only, and a signed-off row never changes again. */
export const scenarioRevisions = pgTable(
  'scenario_revisions',
  {
    id: serial('id').primaryKey(),
    scenarioId: integer('scenario_id')
      .notNull()
      .references(() => scenarios.id),
    /** 1, 2, 3 … within the scenario. */
    number: integer('number').notNull(),
    document: jsonb('document').notNull(),
    note: text('note').notNull().default(''),
    authorId: integer('author_id')
      .notNull()
      .references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    signedOffBy: integer('signed_off_by').references(() => users.id),
    signedOffAt: timestamp('signed_off_at', { withTimezone: true }),
    signOffNote: text('sign_off_note'),
  },
  (table) => [unique('scenario_revisions_number_unique').on(table.scenarioId, table.number)],
);

/** Admin invitations; the link token is stored only as its SHA-256. */
export const invitations = pgTable('invitations', {
  id: serial('id').primaryKey(),
  teamId: integer('team_id')
    .notNull()
    .references(() => teams.id),
  email: varchar('email', { length: 254 }).notNull(),
  role: roleEnum('role').notNull(),
  tokenHash: text('token_hash').notNull().unique(),
  invitedBy: integer('invited_by')
    .notNull()
    .references(() => users.id),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  acceptedAt: timestamp('accepted_at', { withTimezone: true }),
  revokedAt: timestamp('revoked_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/** Password-reset links; the token is stored only as its SHA-256. */
export const passwordResets = pgTable('password_resets', {
  id: serial('id').primaryKey(),
  userId: integer('user_id')
    .notNull()
    .references(() => users.id),
  tokenHash: text('token_hash').notNull().unique(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/** A scenario handed to a teammate; handing it again to the same person replaces the row. */
export const handoffs = pgTable(
  'handoffs',
  {
    id: serial('id').primaryKey(),
    teamId: integer('team_id')
      .notNull()
      .references(() => teams.id),
    scenarioId: integer('scenario_id')
      .notNull()
      .references(() => scenarios.id),
    fromUserId: integer('from_user_id')
      .notNull()
      .references(() => users.id),
    toUserId: integer('to_user_id')
      .notNull()
      .references(() => users.id),
    access: handoffAccessEnum('access').notNull(),
    message: text('message').notNull().default(''),
    revisionNumber: integer('revision_number').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [unique('handoffs_scenario_recipient_unique').on(table.scenarioId, table.toUserId), index('handoffs_to_idx').on(table.toUserId)],
);

/** Comments on a revision; a reply points at its parent in the same revision. */
export const comments = pgTable(
  'comments',
  {
    id: serial('id').primaryKey(),
    scenarioId: integer('scenario_id')
      .notNull()
      .references(() => scenarios.id),
    revisionId: integer('revision_id')
      .notNull()
      .references(() => scenarioRevisions.id),
    parentId: integer('parent_id').references((): AnyPgColumn => comments.id),
    authorId: integer('author_id')
      .notNull()
      .references(() => users.id),
    body: text('body').notNull(),
    mentionedUserIds: integer('mentioned_user_ids').array().notNull().default(sql`'{}'::integer[]`),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index('comments_scenario_idx').on(table.scenarioId)],
);

/** Who did what, when: per team, and per scenario where there is one. */
export const activity = pgTable(
  'activity',
  {
    id: serial('id').primaryKey(),
    teamId: integer('team_id')
      .notNull()
      .references(() => teams.id),
    scenarioId: integer('scenario_id').references(() => scenarios.id),
    actorId: integer('actor_id')
      .notNull()
      .references(() => users.id),
    action: text('action').notNull(),
    detail: jsonb('detail').notNull().default({}),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index('activity_team_idx').on(table.teamId, table.createdAt), index('activity_scenario_idx').on(table.scenarioId, table.createdAt)],
);

/** The fake mail transport's outbox (MAIL_TRANSPORT=outbox), shown to admins at /api/dev/mailbox. */
export const outbox = pgTable(
  'outbox',
  {
    id: serial('id').primaryKey(),
    /** Team the message concerns, so an admin sees only their own team's mail. */
    teamId: integer('team_id').references(() => teams.id),
    messageId: text('message_id').notNull(),
    fromAddress: text('from_address').notNull(),
    toAddress: text('to_address').notNull(),
    subject: text('subject').notNull(),
    text: text('text').notNull(),
    html: text('html').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index('outbox_team_idx').on(table.teamId)],
);

/** Cookie sessions, in the layout connect-pg-simple reads and writes. */
export const sessions = pgTable(
  'session',
  {
    sid: varchar('sid').primaryKey(),
    sess: json('sess').notNull(),
    expire: timestamp('expire', { precision: 6 }).notNull(),
  },
  (table) => [index('IDX_session_expire').on(table.expire)],
);

/**
 * Sign-in failure counters and lockouts, in the layout rate-limiter-flexible's RateLimiterPostgres
 * reads and writes (it is passed tableCreated: true, so the app's role needs no DDL). Keys are
 * "account:<SHA-256 of the e-mail>" and "address:<client address>"; `expire` is a Unix time in ms.
 */
export const signInLimits = pgTable(
  'sign_in_limits',
  {
    key: varchar('key', { length: 255 }).primaryKey(),
    points: integer('points').notNull().default(0),
    expire: bigint('expire', { mode: 'number' }),
  },
  (table) => [index('sign_in_limits_expire_idx').on(table.expire)],
);

/**
 * Samples of one signal as PostgreSQL bytea: the Float64 values back to back, little-endian
 * (sim-server/logs/sample-bytes.ts). node-postgres sends a Buffer as a binary parameter, so a
 * signal travels as its 8 bytes a value with no text form on the way in or out.
 */
const float64Bytes = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });

/**
 * Logged joint traces (issue 12) attached to a scenario of a team: how the file was read and
 * what the reading did, and the newest fit against it. The samples are in joint_log_signals.
 * Only the team sees a log; only its owner deletes it.
 */
export const jointLogs = pgTable(
  'joint_logs',
  {
    id: serial('id').primaryKey(),
    teamId: integer('team_id')
      .notNull()
      .references(() => teams.id),
    scenarioId: integer('scenario_id')
      .notNull()
      .references(() => scenarios.id),
    ownerId: integer('owner_id')
      .notNull()
      .references(() => users.id),
    name: text('name').notNull(),
    /** The uploaded file's own name, for the list and the download. */
    fileName: text('file_name').notNull(),
    /** The confirmed reading options (shared/calibration/log-options.ts, defaults filled in): mapping, units, policies. */
    readOptions: jsonb('read_options').notNull(),
    /** Samples in each of the log's signals. */
    sampleCount: integer('sample_count').notNull(),
    /** The reader's report (StoredLogReport): columns, units, what was dropped, resampled or removed. */
    parseReport: jsonb('parse_report').notNull(),
    /** The newest fit against this log (written by the fit), null until one ran. */
    fitReport: jsonb('fit_report'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index('joint_logs_scenario_idx').on(table.scenarioId, table.createdAt), index('joint_logs_team_idx').on(table.teamId), check('joint_logs_sample_count', sql`${table.sampleCount} >= 2`)],
);

/**
 * A log's samples, one row per signal (not per sample): time in s, angle and set-point in rad,
 * velocity in rad/s, torque in N·m, as one bytea of Float64. A row per signal lets each be
 * written and read in a statement of its own, so no statement carries the whole log at once.
 */
export const jointLogSignals = pgTable(
  'joint_log_signals',
  {
    logId: integer('log_id')
      .notNull()
      .references(() => jointLogs.id, { onDelete: 'cascade' }),
    signal: text('signal').notNull(),
    samples: float64Bytes('samples').notNull(),
  },
  (table) => [
    primaryKey({ columns: [table.logId, table.signal] }),
    check('joint_log_signals_signal', sql`${table.signal} in ('time', 'angle', 'velocity', 'setpoint', 'torque')`),
    // Whole Float64s only, at least two: a truncated write cannot be stored.
    check('joint_log_signals_whole_samples', sql`octet_length(${table.samples}) >= 16 and octet_length(${table.samples}) % 8 = 0`),
  ],
);
