import { catalogueEntry, type CatalogueEntry } from '../scenario/parameter-catalogue';
import { resolveNonlinear } from '../scenario/nonlinear-schema';
import type { TwinScenario } from '../twin/recorded-samples';

/**
 * The parameters a calibration may fit, each under the name the command line and the report use,
 * its catalogue entry (label, unit, bounds: the catalogue is their one home) and how it is read
 * from and written into a scenario. Every fittable catalogue entry appears here once.
 */

export const FIT_PARAMETER_NAMES = ['inertia', 'damping', 'stiffness', 'coulombFriction', 'staticFriction', 'torqueOffset', 'inputDelay'] as const;
export type FitParameterName = (typeof FIT_PARAMETER_NAMES)[number];

export interface FitParameter {
  name: FitParameterName;
  entry: CatalogueEntry;
  get(scenario: TwinScenario): number;
  /** A copy of the scenario with the parameter at `value` (nothing shared is changed). */
  set(scenario: TwinScenario, value: number): TwinScenario;
}

const withNonlinear = (s: TwinScenario, patch: Partial<TwinScenario['nonlinear']>): TwinScenario => ({ ...s, nonlinear: { ...s.nonlinear, ...patch } });

export const FIT_PARAMETERS: Readonly<Record<FitParameterName, FitParameter>> = {
  inertia: { name: 'inertia', entry: catalogueEntry('joint.inertia'), get: (s) => s.joint.inertia, set: (s, v) => ({ ...s, joint: { ...s.joint, inertia: v } }) },
  damping: { name: 'damping', entry: catalogueEntry('joint.damping'), get: (s) => s.joint.damping, set: (s, v) => ({ ...s, joint: { ...s.joint, damping: v } }) },
  stiffness: { name: 'stiffness', entry: catalogueEntry('joint.stiffness'), get: (s) => s.joint.stiffness, set: (s, v) => ({ ...s, joint: { ...s.joint, stiffness: v } }) },
  // Breakaway stays at least the sliding level (the schema's rule): a Coulomb level fitted above an
  // explicit static friction lifts it along, and a fitted static friction never drops below Coulomb.
  coulombFriction: {
    name: 'coulombFriction',
    entry: catalogueEntry('nonlinear.coulombFriction'),
    get: (s) => resolveNonlinear(s.nonlinear).coulombFriction,
    set: (s, v) => {
      const stat = s.nonlinear.staticFriction;
      return withNonlinear(s, stat != null && stat < v ? { coulombFriction: v, staticFriction: v } : { coulombFriction: v });
    },
  },
  staticFriction: {
    name: 'staticFriction',
    entry: catalogueEntry('nonlinear.staticFriction'),
    get: (s) => resolveNonlinear(s.nonlinear).staticFriction,
    set: (s, v) => withNonlinear(s, { staticFriction: Math.max(v, resolveNonlinear(s.nonlinear).coulombFriction) }),
  },
  torqueOffset: {
    name: 'torqueOffset',
    entry: catalogueEntry('nonlinear.torqueOffset'),
    get: (s) => resolveNonlinear(s.nonlinear).torqueOffset,
    set: (s, v) => withNonlinear(s, { torqueOffset: v }),
  },
  // One dead time for every recorded input: they were logged on one clock.
  inputDelay: {
    name: 'inputDelay',
    entry: catalogueEntry('recordedInputs[].delay'),
    get: (s) => s.recordedInputs?.[0]?.delay ?? 0,
    set: (s, v) => ({ ...s, recordedInputs: (s.recordedInputs ?? []).map((term) => ({ ...term, delay: v })) }),
  },
};

/** Whether `name` is a fit parameter's name. */
export function isFitParameterName(name: string): name is FitParameterName {
  return (FIT_PARAMETER_NAMES as readonly string[]).includes(name);
}
