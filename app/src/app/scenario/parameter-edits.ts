import { fieldLabel, PARAMETER_CATALOGUE } from '@kinetwin/shared/scenario/parameter-catalogue';

/** A numeric parameter the scenario page edits, named by its dotted scenario path. */
export interface EditableParameter {
  path: string;
  label: string;
  unit: string;
}

/**
 * What the scenario page lets an editor change before saving a revision: the catalogue's editable
 * numbers outside the input terms (those need the term's channel and shape, which the bench edits).
 * Edits are applied by the shared applyFieldEdits (shared/scenario/field-edits.ts).
 */
export const EDITABLE_PARAMETERS: readonly EditableParameter[] = PARAMETER_CATALOGUE.filter((e) => e.editable && e.group !== 'inputs').map((e) => ({
  path: e.path,
  label: fieldLabel(e),
  unit: e.unit,
}));
