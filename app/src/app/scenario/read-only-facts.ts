import { choiceText } from '@kinetwin/shared/scenario/choice-parameters';
import { valueAtPath } from '@kinetwin/shared/scenario/field-edits';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { tuningGroups } from '../bench/tuning-fields';

/** One parameter of a revision as the scenario page's read-only view lists it. */
export interface ReadOnlyFact {
  path: string;
  label: string;
  /** The stored number exactly (a revision on view must not hide a digit), or the choice in words. */
  value: string;
  unit: string;
}

/**
 * The parameters of a revision the page lists: the bench's tuning fields outside the input terms
 * (which the page lists on their own), so labels, units and order come from the shared catalogue.
 * @example readOnlyFacts(gantry)[0] // { path: 'joint.inertia', label: 'Inertia J', value: '0.05', unit: 'kg·m²' }
 */
export function readOnlyFacts(scenario: Scenario): ReadOnlyFact[] {
  return tuningGroups(scenario)
    .filter((group) => !group.key.startsWith('inputs'))
    .flatMap((group) => group.fields)
    .map((field) => {
      const value = valueAtPath(scenario, field.path);
      if (typeof value === 'string') return { path: field.path, label: field.label, value: choiceText(field.path, value), unit: '' };
      // An effect the revision leaves out is off; any other missing value is a dash.
      const missing = field.path.startsWith('nonlinear.') ? 'none' : '—';
      return { path: field.path, label: field.label, value: value === undefined || value === null ? missing : String(value), unit: field.unit };
    });
}
