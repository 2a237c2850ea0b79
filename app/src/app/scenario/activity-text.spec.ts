import type { ActivityEntry } from '@kinetwin/shared/protocol/library-api';
import { activityText } from './activity-text';

const base: Omit<ActivityEntry, 'action' | 'detail'> = {
  id: 1,
  actor: { id: 2, displayName: 'Tomás' },
  scenario: { id: 5, name: 'Gantry' },
  createdAt: '2026-12-01T10:00:00.000Z',
};

describe('activityText', () => {
  it('names the revision, recipient and access of the events that carry them', () => {
    expect(activityText({ ...base, action: 'revision.signed-off', detail: { revision: 4, safetyAcknowledged: true } })).toBe('signed off revision 4 of “Gantry”');
    expect(activityText({ ...base, action: 'scenario.handed-off', detail: { to: 'Tomás', access: 'view', revision: 3 } })).toBe('handed “Gantry” to Tomás to view');
    expect(activityText({ ...base, action: 'scenario.restored', detail: { revision: 6, restored: 2 } })).toBe('restored revision 2 as revision 6');
  });

  it('describes team events without a scenario', () => {
    expect(activityText({ ...base, scenario: null, action: 'member.role-changed', detail: { member: 'Kofi', from: 'viewer', to: 'engineer' } })).toBe(
      'changed the role of Kofi from viewer to engineer',
    );
  });
});
