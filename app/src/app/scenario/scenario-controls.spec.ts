import type { ScenarioAccess } from '@kinetwin/shared/protocol/library-api';
import { type ControlsContext, scenarioControls } from './scenario-controls';

const none: ScenarioAccess = { edit: false, archive: false, signOff: false, comment: false, handOff: false, handOffEdit: false };
const owner: ScenarioAccess = { edit: true, archive: true, signOff: false, comment: true, handOff: true, handOffEdit: true };
const lead: ScenarioAccess = { edit: false, archive: false, signOff: true, comment: true, handOff: true, handOffEdit: false };
const onNewest: Omit<ControlsContext, 'access' | 'role'> = { archived: false, viewingNewest: true, viewedSignedOff: false };

const shown = (context: ControlsContext) =>
  Object.entries(scenarioControls(context))
    .filter(([, on]) => on)
    .map(([name]) => name);

describe('scenarioControls', () => {
  it('gives a viewer nothing that changes the scenario; running it changes nothing', () => {
    expect(shown({ ...onNewest, access: none, role: 'viewer' })).toEqual(['run']);
  });

  it('lets the owning engineer save on the newest revision and restore on an older one', () => {
    expect(shown({ ...onNewest, access: owner, role: 'engineer' })).toEqual(['save', 'rename', 'tag', 'archive', 'duplicate', 'run', 'handOff', 'comment']);
    const older = scenarioControls({ ...onNewest, viewingNewest: false, access: owner, role: 'engineer' });
    expect([older.save, older.restore]).toEqual([false, true]);
  });

  it('lets a lead sign off a revision that is not signed off yet, but not edit what is not theirs', () => {
    expect(shown({ ...onNewest, access: lead, role: 'lead' })).toEqual(['duplicate', 'run', 'handOff', 'comment', 'signOff']);
    expect(scenarioControls({ ...onNewest, viewedSignedOff: true, access: lead, role: 'lead' }).signOff).toBe(false);
  });

  it('keeps an archived scenario read-only except for restoring it from the archive', () => {
    const archived = scenarioControls({ ...onNewest, archived: true, access: { ...owner, edit: false }, role: 'engineer' });
    expect([archived.save, archived.rename, archived.handOff, archived.signOff, archived.archive]).toEqual([false, false, false, false, true]);
  });

  it('refuses running, commenting on and handing off an archived scenario, as the server does, whatever the access says', () => {
    const archived = scenarioControls({ ...onNewest, archived: true, access: owner, role: 'engineer' });
    expect([archived.run, archived.comment, archived.handOff]).toEqual([false, false, false]);
  });
});
