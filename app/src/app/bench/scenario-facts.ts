import { choiceText } from '@kinetwin/shared/scenario/choice-parameters';
import { valueAtPath } from '@kinetwin/shared/scenario/field-edits';
import { catalogueEntry, fieldLabel } from '@kinetwin/shared/scenario/parameter-catalogue';
import type { InputTerm, Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { amplitudeUnit, extraTermKey } from '@kinetwin/shared/scenario/term-units';
import { type TuningField, tuningGroups } from './tuning-fields';

/** One labelled quantity on the bench's scenario panel. */
export interface ScenarioFact {
  /** Stable key for `track`: the parameter's dotted path. */
  key: string;
  label: string;
  value: string;
}

/**
 * Below this magnitude (in the quantity's SI unit) a computed result shows as 0: double-precision
 * roundoff of O(1) values is ~1e-16 (machine epsilon 2.22e-16, IEEE 754), so a pole's real part
 * or a final value of −2.22e-16 is dust, not a number to read. Typed parameters never round to 0.
 */
export const RESULT_RESOLUTION = 1e-12;

/**
 * A number for people, in the app's one notation: four significant figures, no trailing zeros,
 * e-notation ("1.5e-7", "2.5e+6", as the charts' axes: CHART_EXPONENT_FORMAT) only when tiny or huge.
 * @example formatQuantity(0.02, 'kg·m²') // "0.02 kg·m²"
 */
export function formatQuantity(value: number, unit = ''): string {
  const magnitude = Math.abs(value);
  const text =
    value === 0 ? '0' : magnitude >= 1e-3 && magnitude < 1e6 ? String(Number(value.toPrecision(4))) : value.toExponential(3).replace(/\.?0+e/, 'e');
  return unit ? `${text} ${unit}` : text;
}

/**
 * A computed result (a pole, a final value, a sample, a residual): as formatQuantity, but 0 below
 * RESULT_RESOLUTION, so roundoff never reads as a value.
 * @example formatResult(-2.220446049250313e-16, 'rad') // "0 rad"
 */
export function formatResult(value: number, unit = ''): string {
  return formatQuantity(Math.abs(value) < RESULT_RESOLUTION ? 0 : value, unit);
}

/** A term field in words: the catalogue's label with its symbol, e.g. "Pulse width w". */
const termFieldText = (key: string) => fieldLabel(catalogueEntry(`inputs[].${key}`)).replace(/^./, (c) => c.toLowerCase());

/**
 * One forcing term in words, units from the shared catalogue and amplitudeUnit.
 * @example describeInputTerm({ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0 }) // "reference step 0.5 rad at t = 0 s"
 */
export function describeInputTerm(term: InputTerm): string {
  const parts = [`${term.channel} ${term.shape} ${formatQuantity(term.amplitude, amplitudeUnit(term.channel, term.shape))} at t = ${formatQuantity(term.delay, 's')}`];
  const extra = extraTermKey(term.shape);
  const value = extra === null ? undefined : term[extra];
  if (extra !== null && value !== undefined) parts.push(`${termFieldText(extra)} ${formatQuantity(value, catalogueEntry(`inputs[].${extra}`).unit)}`);
  return parts.join(', ');
}

/**
 * The joint, controller and run quantities the bench shows beside the twin: the tuning form's
 * fields outside the input terms (labels and units from the shared catalogue), choices in words;
 * an open loop shows its mode only, since it has no gains.
 */
export function scenarioFacts(scenario: Scenario): ScenarioFact[] {
  // tuningGroups leaves out what the mode does not use (an open loop's gains).
  return tuningGroups(scenario)
    .filter((group) => !group.key.startsWith('inputs'))
    .flatMap((group) => group.fields)
    .map((field) => ({ key: field.path, label: field.label, value: factValue(scenario, field) }));
}

function factValue(scenario: Scenario, field: TuningField): string {
  const value = valueAtPath(scenario, field.path);
  if (typeof value === 'string') return choiceText(field.path, value);
  // An effect the scenario leaves out is off.
  if (typeof value !== 'number') return field.path.startsWith('nonlinear.') ? 'none' : '—';
  // A derivative filter of 0 s means the derivative is unfiltered (the catalogue's lower bound).
  if (field.path === 'controller.derivativeFilter' && value === 0) return 'none';
  return formatQuantity(value, field.unit);
}
