import type { Role } from '@kinetwin/shared/protocol/api-types';
import type { ScenarioAccess } from '@kinetwin/shared/protocol/library-api';

/** Which controls the scenario page shows; the server enforces the same rules on every call. */
export interface ScenarioControls {
  /** Edit the parameters and save a revision (only on the newest revision). */
  save: boolean;
  /** Restore an older revision as the newest. */
  restore: boolean;
  rename: boolean;
  tag: boolean;
  archive: boolean;
  duplicate: boolean;
  /** Open the stored scenario on the bench and run it (refused while archived, like the server). */
  run: boolean;
  handOff: boolean;
  comment: boolean;
  /** Sign off the revision on view (not when it already is). */
  signOff: boolean;
}

/** What the user sees of a scenario and the revision on view. */
export interface ControlsContext {
  access: ScenarioAccess;
  role: Role | null;
  archived: boolean;
  viewingNewest: boolean;
  viewedSignedOff: boolean;
}

/**
 * The page's controls from the server's access answer for this user and scenario (ownership and
 * hand-offs are already folded in there) and what is on view. Duplicating needs only the role,
 * as the server's rule does.
 * @example scenarioControls({ access: viewerAccess, role: 'viewer', … }).save // false
 */
export function scenarioControls({ access, role, archived, viewingNewest, viewedSignedOff }: ControlsContext): ScenarioControls {
  const mayCreate = role === 'engineer' || role === 'lead' || role === 'admin';
  return {
    save: access.edit && viewingNewest && !archived,
    restore: access.edit && !viewingNewest && !archived,
    rename: access.edit && !archived,
    tag: access.edit && !archived,
    archive: access.archive,
    duplicate: mayCreate,
    run: !archived,
    handOff: access.handOff && !archived,
    comment: access.comment && !archived,
    signOff: access.signOff && !archived && !viewedSignedOff,
  };
}
