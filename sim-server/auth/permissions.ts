import type { Role } from '../../shared/protocol/api-types';

/**
 * Which roles may attempt each action: the one table every route is guarded by. Ownership rules
 * come on top inside the handlers (an engineer edits only scenarios they own or were handed for
 * editing; archive needs the owner or an admin), and the team boundary on top of that (another
 * team's ids answer 404).
 */
export const PERMISSIONS = {
  'scenario.read': ['viewer', 'engineer', 'lead', 'admin'],
  'scenario.create': ['engineer', 'lead', 'admin'],
  'scenario.edit': ['engineer', 'lead', 'admin'],
  'scenario.duplicate': ['engineer', 'lead', 'admin'],
  'scenario.archive': ['engineer', 'lead', 'admin'],
  'scenario.export': ['viewer', 'engineer', 'lead', 'admin'],
  'scenario.hand-off': ['engineer', 'lead', 'admin'],
  'handoff.read': ['viewer', 'engineer', 'lead', 'admin'],
  'comment.read': ['viewer', 'engineer', 'lead', 'admin'],
  'comment.write': ['engineer', 'lead', 'admin'],
  'revision.sign-off': ['lead', 'admin'],
  'activity.read': ['viewer', 'engineer', 'lead', 'admin'],
  'team.read': ['viewer', 'engineer', 'lead', 'admin'],
  'team.manage': ['admin'],
  'mailbox.read': ['admin'],
  'bench.check': ['viewer', 'engineer', 'lead', 'admin'],
  'log.read': ['viewer', 'engineer', 'lead', 'admin'],
  'log.upload': ['engineer', 'lead', 'admin'],
  'log.delete': ['engineer', 'lead', 'admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof PERMISSIONS;

/** Access of a route: an action of the table, any signed-in user, or anyone. */
export type RouteAccess = Action | 'signed-in' | 'public';

/** Whether a role may attempt an action. */
export function roleMay(role: Role, action: Action): boolean {
  return (PERMISSIONS[action] as readonly Role[]).includes(role);
}

/** Words for a refusal, naming the role and the action, never the resource. */
export const ACTION_WORDS: Record<Action, string> = {
  'scenario.read': 'read scenarios',
  'scenario.create': 'create scenarios',
  'scenario.edit': 'edit scenarios',
  'scenario.duplicate': 'duplicate scenarios',
  'scenario.archive': 'archive scenarios',
  'scenario.export': 'export scenarios',
  'scenario.hand-off': 'hand off scenarios',
  'handoff.read': 'read hand-offs',
  'comment.read': 'read comments',
  'comment.write': 'write comments',
  'revision.sign-off': 'sign off revisions',
  'activity.read': 'read the activity log',
  'team.read': 'see the team',
  'team.manage': 'manage team members and invitations',
  'mailbox.read': 'read the dev mailbox',
  'bench.check': 'run checks on the bench',
  'log.read': 'read logged traces',
  'log.upload': 'upload logged traces',
  'log.delete': 'delete logged traces',
};
