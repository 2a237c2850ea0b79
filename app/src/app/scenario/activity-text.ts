import type { ActivityEntry } from '@kinetwin/shared/protocol/library-api';

function detail(entry: ActivityEntry, key: string): string {
  const value = entry.detail[key];
  return value === undefined || value === null ? '' : String(value);
}

/**
 * One line of the activity log, without the actor and time the list shows beside it.
 * @example activityText({ action: 'revision.signed-off', detail: { revision: 4 }, … }) // "signed off revision 4"
 */
export function activityText(entry: ActivityEntry): string {
  const revision = detail(entry, 'revision');
  const scenario = entry.scenario ? ` “${entry.scenario.name}”` : '';
  switch (entry.action) {
    case 'scenario.created':
      return `created${scenario}`;
    case 'scenario.imported':
      return `imported${scenario} from a file`;
    case 'scenario.saved':
      return `saved revision ${revision}${scenario ? ` of${scenario}` : ''}`;
    case 'scenario.restored':
      return `restored revision ${detail(entry, 'restored')} as revision ${revision}`;
    case 'scenario.renamed':
      return `renamed “${detail(entry, 'from')}” to “${detail(entry, 'to')}”`;
    case 'scenario.tagged':
      return `set the tags of${scenario} to ${detail(entry, 'tags') || 'none'}`;
    case 'scenario.duplicated':
      return `duplicated revision ${detail(entry, 'fromRevision')} of scenario ${detail(entry, 'fromScenario')} as${scenario}`;
    case 'scenario.archived':
      return `archived${scenario}`;
    case 'scenario.unarchived':
      return `restored${scenario} from the archive`;
    case 'scenario.exported':
      return `exported revision ${revision}${scenario ? ` of${scenario}` : ''}`;
    case 'scenario.handed-off':
      return `handed${scenario} to ${detail(entry, 'to')} to ${detail(entry, 'access')}`;
    case 'revision.signed-off':
      return `signed off revision ${revision}${scenario ? ` of${scenario}` : ''}`;
    case 'comment.added':
      return `commented on revision ${revision}${scenario ? ` of${scenario}` : ''}`;
    case 'member.joined':
      return 'joined the team';
    case 'member.invited':
      return `invited ${detail(entry, 'email')} as ${detail(entry, 'role')}`;
    case 'member.role-changed':
      return `changed the role of ${detail(entry, 'member')} from ${detail(entry, 'from')} to ${detail(entry, 'to')}`;
    case 'member.removed':
      return `removed ${detail(entry, 'member')} from the team`;
  }
}
