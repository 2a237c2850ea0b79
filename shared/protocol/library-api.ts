import { z } from 'zod';
import type { Scenario } from '../scenario/scenario-schema';
import { MAX_NAME_LENGTH } from '../scenario/scenario-schema';
import type { ScenarioChange } from '../library/scenario-diff';
import { roles, type Role, type SessionUser } from './api-types';

/**
 * The team-library API: accounts and roles, scenario revisions, hand-off, comments, sign-off,
 * activity and the dev mailbox. Request schemas here are the ones the server validates with;
 * the app may reuse them for form checks. Every non-2xx answer is an ApiErrorBody.
 */

/** Shown wherever gains leave the tool (export, sign-off); sign-off must acknowledge it. */
export const SAFETY_CAUTION =
  'A simulation is not a safety validation. Limit torque and speed on the first hardware runs, keep an emergency stop in reach, and follow ISO 10218, local codes and licensed practice.';

/** Response header carrying SAFETY_CAUTION on a scenario export. */
export const SAFETY_CAUTION_HEADER = 'x-kinetwin-safety-caution';

/** Header that carries the CSRF token on every POST/PUT/PATCH/DELETE of a signed-in session. */
export const CSRF_HEADER = 'x-csrf-token';

// ─── limits ────────────────────────────────────────────────────────────────────────────────────
export const MIN_PASSWORD_LENGTH = 10;
export const MAX_PASSWORD_LENGTH = 200;
export const MAX_DISPLAY_NAME_LENGTH = 80;
export const MAX_TEAM_NAME_LENGTH = 80;
/** Revision notes are a line or two; the scenario's own notes field carries the long text. */
export const MAX_REVISION_NOTE_LENGTH = 500;
export const MAX_COMMENT_LENGTH = 4000;
export const MAX_HANDOFF_MESSAGE_LENGTH = 2000;
export const MAX_TAGS = 12;
export const MAX_TAG_LENGTH = 32;
export const MAX_SEARCH_LENGTH = 200;
export const DEFAULT_PAGE_SIZE = 50;
export const MAX_PAGE_SIZE = 100;
/** Page numbers past this are refused: nobody pages that far, and OFFSET grows linearly. */
export const MAX_PAGE = 10_000;
/** Postgres serial ids stop at 2^31 − 1; anything else is a malformed id, not a missing one. */
export const MAX_ID = 2_147_483_647;

const email = z
  .string({ error: 'email must be text' })
  .trim()
  .toLowerCase()
  .min(1, { error: 'email is required' })
  .max(254, { error: 'email must be at most 254 characters' })
  .pipe(z.email({ error: 'email is not a valid e-mail address' }));

const displayName = z
  .string({ error: 'displayName must be text' })
  .trim()
  .min(1, { error: 'displayName must not be empty' })
  .max(MAX_DISPLAY_NAME_LENGTH, { error: `displayName must be at most ${MAX_DISPLAY_NAME_LENGTH} characters` });

/** Length only; strength (common words, repeats, e-mail in the password) is checked by passwordProblem(). */
const password = z
  .string({ error: 'password must be text' })
  .min(MIN_PASSWORD_LENGTH, { error: `password must be at least ${MIN_PASSWORD_LENGTH} characters` })
  .max(MAX_PASSWORD_LENGTH, { error: `password must be at most ${MAX_PASSWORD_LENGTH} characters` });

/** Links carry 32 random bytes as base64url: 43 characters. */
const token = z.string({ error: 'token must be text' }).regex(/^[A-Za-z0-9_-]{43}$/, { error: 'token is not a valid link token' });

/** An id in a JSON body: a number, never a string or a boolean that happens to convert. */
export function idField(name: string) {
  return z
    .number({ error: `${name} must be a whole number` })
    .int({ error: `${name} must be a whole number` })
    .positive({ error: `${name} must be positive` })
    .max(MAX_ID, { error: `${name} is too large` });
}

/** An id in a query string or path, where everything arrives as text. */
export function queryIdField(name: string) {
  return z.coerce
    .number({ error: `${name} must be a whole number` })
    .int({ error: `${name} must be a whole number` })
    .positive({ error: `${name} must be positive` })
    .max(MAX_ID, { error: `${name} is too large` });
}

export const roleSchema = z.enum(roles, { error: `role must be one of ${roles.join(', ')}` });

/** Passwords everyone tries first; a small list, not a dictionary. */
const COMMON_PASSWORDS = new Set(['password', 'password1', 'password12', 'password123', '1234567890', '0123456789', 'qwertyuiop', 'letmein123', 'iloveyou12', 'kinetwin123', 'welcome123', 'administrator', 'abcdefghij']);

/**
 * Why a password is too weak, or null when it is acceptable. Beyond the length rule: not a
 * well-known password, not one repeated character, and not containing the e-mail's local part.
 * @example passwordProblem('aaaaaaaaaaaa', 'a@b.test') // 'password must not be one character repeated'
 */
export function passwordProblem(candidate: string, forEmail: string): string | null {
  if (candidate.length < MIN_PASSWORD_LENGTH) return `password must be at least ${MIN_PASSWORD_LENGTH} characters`;
  if (candidate.length > MAX_PASSWORD_LENGTH) return `password must be at most ${MAX_PASSWORD_LENGTH} characters`;
  const lower = candidate.toLowerCase();
  if (COMMON_PASSWORDS.has(lower)) return 'password is one of the most common passwords; choose another';
  if (new Set(lower).size === 1) return 'password must not be one character repeated';
  if (new Set(lower).size < 4) return 'password must use at least 4 different characters';
  const local = forEmail.trim().toLowerCase().split('@')[0] ?? '';
  if (local.length >= 4 && lower.includes(local)) return 'password must not contain your e-mail name';
  return null;
}

// ─── auth ──────────────────────────────────────────────────────────────────────────────────────

/** POST /api/auth/sign-up. With invitationToken the account joins the inviting team with the invited role. */
export const signUpSchema = z.strictObject({
  email,
  password,
  displayName,
  /** Name of the new team (sign-up without an invitation); defaults to "<displayName>'s team". */
  teamName: z.string({ error: 'teamName must be text' }).trim().min(1, { error: 'teamName must not be empty' }).max(MAX_TEAM_NAME_LENGTH, { error: `teamName must be at most ${MAX_TEAM_NAME_LENGTH} characters` }).optional(),
  invitationToken: token.optional(),
});
export type SignUpRequest = z.input<typeof signUpSchema>;

/** Answer of sign-in, sign-up and password-reset completion: the user and the session's CSRF token. */
export interface SignedIn {
  user: SessionUser;
  csrfToken: string;
}

/** GET /api/auth/csrf. */
export interface CsrfTokenResponse {
  csrfToken: string;
}

/** POST /api/auth/password-reset/request. Always 202, whether or not the e-mail has an account. */
export const passwordResetRequestSchema = z.strictObject({ email });
export type PasswordResetRequest = z.input<typeof passwordResetRequestSchema>;

/** POST /api/auth/password-reset/complete. */
export const passwordResetCompleteSchema = z.strictObject({ token, password });
export type PasswordResetComplete = z.input<typeof passwordResetCompleteSchema>;

/** POST /api/auth/invitations/lookup: what an invitation link offers, before signing up. */
export const invitationLookupSchema = z.strictObject({ token });
export interface InvitationPreview {
  email: string;
  teamName: string;
  role: Role;
  /** ISO 8601. */
  expiresAt: string;
}

// ─── team ──────────────────────────────────────────────────────────────────────────────────────

export interface TeamMember extends SessionUser {
  /** ISO 8601. */
  joinedAt: string;
}

/** GET /api/team. */
export interface TeamResponse {
  team: { id: number; name: string };
  members: TeamMember[];
}

/** POST /api/team/invitations (admin). */
export const invitationCreateSchema = z.strictObject({ email, role: roleSchema });
export type InvitationCreateRequest = z.input<typeof invitationCreateSchema>;

export interface InvitationSummary {
  id: number;
  email: string;
  role: Role;
  invitedBy: string;
  /** ISO 8601. */
  expiresAt: string;
  /** ISO 8601. */
  createdAt: string;
}

/** PATCH /api/team/members/:id (admin). */
export const memberRoleSchema = z.strictObject({ role: roleSchema });

// ─── library ───────────────────────────────────────────────────────────────────────────────────

export const scenarioStatuses = ['draft', 'signed-off', 'archived'] as const;
/** draft: the newest revision is not signed off; signed-off: it is; archived: soft-deleted. */
export type ScenarioStatus = (typeof scenarioStatuses)[number];
/** How every page names a status (the code words stay in the API and the filter values). */
export const SCENARIO_STATUS_LABELS: Readonly<Record<ScenarioStatus, string>> = { draft: 'Draft', 'signed-off': 'Signed off', archived: 'Archived' };

const tag = z
  .string({ error: 'tag must be text' })
  .trim()
  .toLowerCase()
  .min(1, { error: 'a tag must not be empty' })
  .max(MAX_TAG_LENGTH, { error: `a tag must be at most ${MAX_TAG_LENGTH} characters` })
  .regex(/^[a-z0-9][a-z0-9 ._-]*$/, { error: 'a tag may hold letters, digits, spaces, dots, dashes and underscores' });

export const tagsSchema = z
  .array(tag, { error: 'tags must be a list of text' })
  .max(MAX_TAGS, { error: `at most ${MAX_TAGS} tags are allowed` })
  .transform((list) => [...new Set(list)].sort());

const revisionNote = z
  .string({ error: 'note must be text' })
  .trim()
  .max(MAX_REVISION_NOTE_LENGTH, { error: `note must be at most ${MAX_REVISION_NOTE_LENGTH} characters` })
  .default('');

export const librarySorts = ['updatedAt', 'name', 'owner', 'status'] as const;

/** Query of GET /api/scenarios; unknown parameters are refused, repeated ones too. */
export const libraryQuerySchema = z.strictObject({
  q: z.string({ error: 'q must be given once' }).trim().max(MAX_SEARCH_LENGTH, { error: `q must be at most ${MAX_SEARCH_LENGTH} characters` }).optional(),
  tag: tag.optional(),
  owner: queryIdField('owner').optional(),
  /** Default: every status except archived. */
  status: z.enum([...scenarioStatuses, 'all'], { error: `status must be one of ${scenarioStatuses.join(', ')} or all` }).optional(),
  sort: z.enum(librarySorts, { error: `sort must be one of ${librarySorts.join(', ')}` }).default('updatedAt'),
  order: z.enum(['asc', 'desc'], { error: 'order must be asc or desc' }).optional(),
  page: z.coerce.number({ error: 'page must be a whole number' }).int({ error: 'page must be a whole number' }).min(1, { error: 'page must be at least 1' }).max(MAX_PAGE, { error: `page must be at most ${MAX_PAGE}` }).default(1),
  pageSize: z.coerce.number({ error: 'pageSize must be a whole number' }).int({ error: 'pageSize must be a whole number' }).min(1, { error: 'pageSize must be at least 1' }).max(MAX_PAGE_SIZE, { error: `pageSize must be at most ${MAX_PAGE_SIZE}` }).default(DEFAULT_PAGE_SIZE),
});
export type LibraryQuery = z.input<typeof libraryQuerySchema>;
/** A library query after validation, defaults filled in. */
export type ParsedLibraryQuery = z.output<typeof libraryQuerySchema>;


/**
 * The scenario document travels as plain JSON and is validated with parseScenario on the server
 * (field errors under "scenario.…"), so it is `unknown` here.
 */
export const scenarioCreateSchema = z.strictObject({
  scenario: z.unknown(),
  note: revisionNote,
  tags: tagsSchema.default([]),
});
export type ScenarioCreateRequest = z.input<typeof scenarioCreateSchema>;

/** PUT /api/scenarios/:id: a new revision on top of baseRevision, or 409 when that is no longer the newest. */
export const scenarioSaveSchema = z.strictObject({
  scenario: z.unknown(),
  note: revisionNote,
  baseRevision: idField('baseRevision'),
});
export type ScenarioSaveRequest = z.input<typeof scenarioSaveSchema>;

/** POST /api/scenarios/import: a scenario file's parsed JSON. */
export const scenarioImportSchema = z.strictObject({
  file: z.unknown(),
  note: revisionNote,
  tags: tagsSchema.default([]),
});
export type ScenarioImportRequest = z.input<typeof scenarioImportSchema>;

/** PATCH /api/scenarios/:id: rename (a new revision, the document's name changes) and/or retag. */
export const scenarioPatchSchema = z
  .strictObject({
    name: z.string({ error: 'name must be text' }).trim().min(1, { error: 'name must not be empty' }).max(MAX_NAME_LENGTH, { error: `name must be at most ${MAX_NAME_LENGTH} characters` }).optional(),
    tags: tagsSchema.optional(),
  })
  .refine((p) => p.name !== undefined || p.tags !== undefined, { error: 'give a name, tags or both' });
export type ScenarioPatchRequest = z.input<typeof scenarioPatchSchema>;

/** POST /api/scenarios/:id/duplicate. */
export const scenarioDuplicateSchema = z.strictObject({
  name: z.string({ error: 'name must be text' }).trim().min(1, { error: 'name must not be empty' }).max(MAX_NAME_LENGTH, { error: `name must be at most ${MAX_NAME_LENGTH} characters` }).optional(),
  /** Revision to copy; default the newest. */
  revision: idField('revision').optional(),
});
export type ScenarioDuplicateRequest = z.input<typeof scenarioDuplicateSchema>;

/** POST /api/scenarios/:id/revisions/:n/restore. */
export const revisionRestoreSchema = z.strictObject({ note: revisionNote, baseRevision: idField('baseRevision') });
export type RevisionRestoreRequest = z.input<typeof revisionRestoreSchema>;

/** GET /api/scenarios/:id/diff?from=&to=. */
export const diffQuerySchema = z.strictObject({ from: queryIdField('from'), to: queryIdField('to') });

/** GET /api/scenarios/:id/export?revision=n (default the newest). */
export const exportQuerySchema = z.strictObject({ revision: queryIdField('revision').optional() });

/** GET /api/scenarios/:id/comments?revision=n (default every revision). */
export const commentsQuerySchema = z.strictObject({ revision: queryIdField('revision').optional() });

export const handoffAccesses = ['view', 'edit'] as const;
export type HandoffAccess = (typeof handoffAccesses)[number];

/** POST /api/scenarios/:id/handoffs. */
export const handoffCreateSchema = z.strictObject({
  toUserId: idField('toUserId'),
  access: z.enum(handoffAccesses, { error: 'access must be view or edit' }),
  message: z.string({ error: 'message must be text' }).trim().max(MAX_HANDOFF_MESSAGE_LENGTH, { error: `message must be at most ${MAX_HANDOFF_MESSAGE_LENGTH} characters` }).default(''),
});
export type HandoffCreateRequest = z.input<typeof handoffCreateSchema>;

/** POST /api/scenarios/:id/revisions/:n/comments. Mentions are written "@email" in the body. */
export const commentCreateSchema = z.strictObject({
  body: z.string({ error: 'body must be text' }).trim().min(1, { error: 'body must not be empty' }).max(MAX_COMMENT_LENGTH, { error: `body must be at most ${MAX_COMMENT_LENGTH} characters` }),
  parentId: idField('parentId').optional(),
});
export type CommentCreateRequest = z.input<typeof commentCreateSchema>;

/** POST /api/scenarios/:id/revisions/:n/sign-off: lead or admin, with the safety caution acknowledged. */
export const signOffSchema = z.strictObject({
  acknowledgeSafety: z.literal(true, { error: 'acknowledgeSafety must be true: read and acknowledge the safety caution' }),
  note: revisionNote,
});
export type SignOffRequest = z.input<typeof signOffSchema>;

/** GET /api/team/activity and /api/scenarios/:id/activity. */
export const activityQuerySchema = z.strictObject({
  page: libraryQuerySchema.shape.page,
  pageSize: libraryQuerySchema.shape.pageSize,
});

// ─── answers ───────────────────────────────────────────────────────────────────────────────────

export interface PersonRef {
  id: number;
  displayName: string;
}

export interface SignOff {
  by: PersonRef;
  /** ISO 8601. */
  at: string;
  note: string;
}

/** One row of GET /api/scenarios (extends the skeleton's ScenarioSummary). */
export interface LibraryItem {
  id: number;
  name: string;
  ownerName: string;
  ownerId: number;
  /** ISO 8601 time of the last change. */
  updatedAt: string;
  lastChangedBy: string | null;
  status: ScenarioStatus;
  tags: string[];
  /** Number of the newest revision. */
  revision: number;
}

/** GET /api/scenarios. */
export interface LibraryPage {
  items: LibraryItem[];
  page: number;
  pageSize: number;
  total: number;
}

/** What the signed-in user may do with a scenario (the server enforces the same rules). */
export interface ScenarioAccess {
  edit: boolean;
  archive: boolean;
  signOff: boolean;
  comment: boolean;
  handOff: boolean;
  handOffEdit: boolean;
}

/** GET /api/scenarios/:id (extends the skeleton's ScenarioDetail). */
export interface LibraryDetail extends LibraryItem {
  scenario: Scenario;
  signOff: SignOff | null;
  archivedAt: string | null;
  access: ScenarioAccess;
}

export interface RevisionSummary {
  number: number;
  note: string;
  author: PersonRef;
  /** ISO 8601. */
  createdAt: string;
  signOff: SignOff | null;
}

/** GET /api/scenarios/:id/revisions/:n: read-only. */
export interface RevisionDetail extends RevisionSummary {
  scenarioId: number;
  scenario: Scenario;
}

/** GET /api/scenarios/:id/revisions. */
export interface RevisionList {
  items: RevisionSummary[];
}

/** The 409 answer of a stale save or restore: nothing is lost, both versions come back. */
export interface StaleSaveBody {
  error: { code: 'stale_revision'; message: string };
  current: RevisionDetail;
  /** The document the request tried to save (validated), with the revision it was based on. */
  yours: { baseRevision: number; scenario: Scenario; note: string };
}

/** GET /api/scenarios/:id/diff. */
export interface RevisionDiff {
  from: RevisionSummary;
  to: RevisionSummary;
  changes: ScenarioChange[];
}

export interface Handoff {
  id: number;
  scenario: { id: number; name: string };
  from: PersonRef;
  to: PersonRef;
  access: HandoffAccess;
  message: string;
  /** Newest revision when it was handed off. */
  revision: number;
  /** ISO 8601. */
  createdAt: string;
}

/** GET /api/handoffs/received and /api/handoffs/sent. */
export interface HandoffList {
  items: Handoff[];
}

export interface Comment {
  id: number;
  revision: number;
  parentId: number | null;
  author: PersonRef;
  body: string;
  mentions: PersonRef[];
  /** ISO 8601. */
  createdAt: string;
  replies: Comment[];
}

/** GET /api/scenarios/:id/comments?revision=n: top-level comments with their replies nested. */
export interface CommentThreadList {
  items: Comment[];
}

export const activityActions = [
  'scenario.created',
  'scenario.imported',
  'scenario.saved',
  'scenario.restored',
  'scenario.renamed',
  'scenario.tagged',
  'scenario.duplicated',
  'scenario.archived',
  'scenario.unarchived',
  'scenario.exported',
  'scenario.handed-off',
  'revision.signed-off',
  'comment.added',
  'member.joined',
  'member.invited',
  'member.role-changed',
  'member.removed',
] as const;
export type ActivityAction = (typeof activityActions)[number];

export interface ActivityEntry {
  id: number;
  action: ActivityAction;
  actor: PersonRef;
  scenario: { id: number; name: string } | null;
  /** Small facts of the event (revision number, new role, recipient); never secrets. */
  detail: Record<string, string | number | boolean | null>;
  /** ISO 8601. */
  createdAt: string;
}

/** GET /api/team/activity and /api/scenarios/:id/activity, newest first. */
export interface ActivityPage {
  items: ActivityEntry[];
  page: number;
  pageSize: number;
  total: number;
}

export interface OutboxMessage {
  id: number;
  to: string;
  from: string;
  subject: string;
  text: string;
  html: string;
  /** ISO 8601. */
  createdAt: string;
}

/** GET /api/dev/mailbox (admin): the fake outbox's messages to the admin's team, newest first. */
export interface Mailbox {
  items: OutboxMessage[];
}
