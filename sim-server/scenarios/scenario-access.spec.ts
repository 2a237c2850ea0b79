import { describe, expect, it } from 'vitest';
import type { Role } from '../../shared/protocol/api-types';
import type { AuthUser } from '../auth/user-store';
import { ARCHIVED_REFUSES } from '../../shared/library/archived-scenario';
import { accessTo, archivedRefusal, refuseIfArchived } from './scenario-access';

const user = (role: Role, id = 1): AuthUser => ({ id, teamId: 1, email: `${role}@lab.test`, displayName: role, role, sessionGeneration: 0 });
const live = { ownerId: 1, archivedAt: null };
const othersLive = { ownerId: 2, archivedAt: null };
const archived = { ownerId: 1, archivedAt: new Date('2026-12-01T00:00:00Z') };

describe('accessTo', () => {
  it('lets a viewer only read, whatever was handed to them', () => {
    expect(accessTo(user('viewer'), live, true)).toEqual({ edit: false, archive: false, signOff: false, comment: false, handOff: false, handOffEdit: false });
  });

  it('lets an engineer edit and archive their own, and edit what was handed for editing', () => {
    expect(accessTo(user('engineer'), live, false)).toMatchObject({ edit: true, archive: true, signOff: false, handOffEdit: true });
    expect(accessTo(user('engineer'), othersLive, false)).toMatchObject({ edit: false, archive: false, handOff: true, handOffEdit: false });
    expect(accessTo(user('engineer'), othersLive, true)).toMatchObject({ edit: true, archive: false, handOffEdit: false });
  });

  it('lets a lead sign off any live scenario but edit only like an engineer', () => {
    expect(accessTo(user('lead'), othersLive, false)).toMatchObject({ edit: false, signOff: true });
  });

  it('lets an admin edit and archive anything of the team', () => {
    expect(accessTo(user('admin'), othersLive, false)).toMatchObject({ edit: true, archive: true, signOff: true, handOffEdit: true });
  });

  it('makes an archived scenario read-only except for restoring it: no comments or hand-offs either', () => {
    expect(accessTo(user('admin'), archived, false)).toEqual({ edit: false, archive: true, signOff: false, comment: false, handOff: false, handOffEdit: false });
  });

  it('refuses acting on an archived scenario with one 409 whose words name what to do first', () => {
    expect(() => refuseIfArchived(live, 'run')).not.toThrow();
    for (const [doing, words] of Object.entries(ARCHIVED_REFUSES)) {
      const refusal = archivedRefusal(doing as keyof typeof ARCHIVED_REFUSES);
      expect(refusal).toMatchObject({ status: 409, code: 'archived', message: `This scenario is archived; restore it before ${words}.` });
      expect(() => refuseIfArchived(archived, doing as keyof typeof ARCHIVED_REFUSES)).toThrow(refusal.message);
    }
    // Sign-off's refusal reads as it did before the rule moved here.
    expect(archivedRefusal('signOff').message).toBe('This scenario is archived; restore it before signing off.');
  });
});
