import { CHOICE_PARAMETERS, parameterApplies } from '@kinetwin/shared/scenario/choice-parameters';
import { type CatalogueEntry, type ParameterGroup, catalogueEntry, fieldLabel, PARAMETER_CATALOGUE, PARAMETER_GROUP_TITLES } from '@kinetwin/shared/scenario/parameter-catalogue';
import { isOptionalEffect, valueAtPath } from '@kinetwin/shared/scenario/field-edits';
import type { InputTerm, Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { amplitudeUnit, termKeys } from '@kinetwin/shared/scenario/term-units';

/** One editable quantity of the scenario, named by its dotted path. */
export interface TuningField {
  /** Dotted scenario path, also the input's `name` ("controller.kp"). */
  path: string;
  label: string;
  unit: string;
  /** Choices for a text field (a select), stored value and the words shown; absent for a number. */
  choices?: readonly { value: string; text: string }[];
}

/** Fields shown together under one heading. */
export interface TuningGroup {
  key: string;
  title: string;
  fields: TuningField[];
}

/** The catalogue's groups the form shows before the input terms, in the catalogue's order. */
const SCENARIO_GROUPS: readonly ParameterGroup[] = ['joint', 'controller', 'initial'];

const numberField = (e: CatalogueEntry, path = e.path, unit = e.unit): TuningField => ({ path, label: fieldLabel(e), unit });

/** A group's editable fields in catalogue order, each choice parameter where its `after` puts it. */
function groupFields(group: ParameterGroup): TuningField[] {
  const fields = PARAMETER_CATALOGUE.filter((e) => e.editable && e.group === group).map((e) => numberField(e));
  for (const c of CHOICE_PARAMETERS.filter((c) => c.editable && c.group === group)) {
    const field = { path: c.path, label: fieldLabel(c), unit: '', choices: Object.entries(c.choices).map(([value, text]) => ({ value, text })) };
    fields.splice(c.after === null ? 0 : fields.findIndex((f) => f.path === c.after) + 1, 0, field);
  }
  return fields;
}

/**
 * The twin effects (torque limit, friction, gravity, dead band, encoder, noise) in words with
 * units from the catalogue: each the scenario has, or may gain by typing a value (empty is none).
 * A gravity load's fields show once the scenario has one.
 */
function effectFields(scenario: Scenario): TuningField[] {
  return PARAMETER_CATALOGUE.filter((e) => e.group === 'nonlinear' && (valueAtPath(scenario, e.path) !== undefined || isOptionalEffect(scenario, e.path))).map((e) => numberField(e));
}

function termFields(term: InputTerm, index: number): TuningField[] {
  return termKeys(term).map((key) => {
    const e = catalogueEntry(`inputs[].${key}`);
    return numberField(e, `inputs.${index}.${key}`, key === 'amplitude' ? amplitudeUnit(term.channel, term.shape) : e.unit);
  });
}

/**
 * The tuning form's fields for a scenario, labels and units from the shared catalogue: joint,
 * controller, initial state and horizon, then each forcing term's amplitude and start time with
 * the extra quantity its shape has, then the twin effects. Under an open loop (`mode`, the edited one when the select
 * changed it) the controller offers only its mode.
 */
export function tuningGroups(scenario: Scenario, mode: string = scenario.controller.mode): TuningGroup[] {
  return [
    ...SCENARIO_GROUPS.map((group) => ({ key: group, title: PARAMETER_GROUP_TITLES[group], fields: groupFields(group).filter((field) => parameterApplies(field.path, mode)) })),
    ...scenario.inputs.map((term, index) => ({
      key: `inputs.${index}`,
      title: `Term ${index}: ${term.channel} ${term.shape}`,
      fields: termFields(term, index),
    })),
    { key: 'nonlinear', title: PARAMETER_GROUP_TITLES.nonlinear, fields: effectFields(scenario) },
  ];
}
