import { z } from 'zod';

/**
 * The one catalogue of Kinetwin's numeric parameters: for each, its dotted path, symbol, label,
 * SI unit and the range the edge accepts, with a reason a user can act on for each bound. The zod
 * schemas build their numbers from here (catalogueNumber), so a bound lives in one place.
 *
 * The ranges refuse values no joint can have — from micro-actuators (rotor inertia ~1e-10 kg·m²)
 * to large industrial axes (~1e6 kg·m²) everything physical passes — so a typo or a hostile
 * 1e308 stops at the edge instead of in the integrator. They cannot foresee every stiff
 * combination of in-range values; the twin's work budget (shared/twin/work-budget.ts) bounds those.
 * Magnitudes are order-of-magnitude engineering estimates (from memory, rounded up generously).
 *
 * One entry per parameter, plain data. The app builds its tuning form, the scenario page's editor
 * and read-only table, the bench's facts list and the revision diff's labels and units from here;
 * text-valued parameters (mode, derivative-on) are in choice-parameters.ts. No display unit
 * differs from the SI unit yet (angles are shown in rad), so there is no display-unit field.
 */

/** One end of a parameter's range. */
export interface ParameterBound {
  value: number;
  /** Whether `value` itself is accepted. */
  inclusive: boolean;
  /** Why the bound is where it is, in words a user understands. */
  reason: string;
}

/**
 * Where a parameter sits in the scenario, in the order an engineer reads one; the tuning form's
 * fieldsets follow it. "initial" holds the initial state and the horizon, the run's time frame.
 */
export type ParameterGroup = 'joint' | 'controller' | 'initial' | 'inputs' | 'limits' | 'nonlinear' | 'run';

/** Headings of the groups as forms and tables show them. */
export const PARAMETER_GROUP_TITLES: Readonly<Record<ParameterGroup, string>> = {
  joint: 'Joint',
  controller: 'Controller',
  initial: 'Initial state and horizon',
  inputs: 'Forcing terms',
  limits: 'Limits',
  nonlinear: 'Twin effects',
  run: 'Run settings',
};

export interface CatalogueEntry {
  /** Dotted path in the scenario ("inputs[]" for every input term; "run." for run settings). */
  path: string;
  /** Symbol used in the README and the bench, e.g. "J", "k_d". */
  symbol: string;
  label: string;
  /** SI unit as shown beside the value ("" for a pure number). */
  unit: string;
  /** Whole numbers only (counts, seeds). */
  integer: boolean;
  min: ParameterBound;
  max: ParameterBound;
  group: ParameterGroup;
  /** Whether the bench's tuning form (and the scenario page's editor, outside inputs) edits it. */
  editable: boolean;
  /**
   * Whether calibration from measured runs may fit it: the plant's own physics (inertia, damping,
   * stiffness, Coulomb and static friction, a constant torque offset) and the dead time between a
   * logged input and the joint, never the controller the engineer chooses, the scenario's own
   * inputs or limits, nor quantities read off a datasheet (gear ratio, encoder).
   */
  fittable: boolean;
}

const HOUR = 3600;

/** Lower bounds that only fix the sign; each carries its own reason. */
const positive = (reason: string): ParameterBound => ({ value: 0, inclusive: false, reason });
const nonNegative = (reason: string): ParameterBound => ({ value: 0, inclusive: true, reason });
const atMost = (value: number, reason: string): ParameterBound => ({ value, inclusive: true, reason });
const atLeast = (value: number, reason: string): ParameterBound => ({ value, inclusive: true, reason });

interface EntryFlags {
  integer?: boolean;
  editable?: boolean;
  fittable?: boolean;
}

/** The group is the path's first segment, except the horizon, which is read with the initial state. */
function groupOf(path: string): ParameterGroup {
  if (path === 'horizon') return 'initial';
  // A recorded input is a forcing term like the others; only its storage differs.
  if (path.startsWith('recordedInputs[].')) return 'inputs';
  const head = path.split('.')[0]!.replace('[]', '');
  if (!(head in PARAMETER_GROUP_TITLES)) throw new Error(`no parameter group for "${path}"`);
  return head as ParameterGroup;
}

const entry = (path: string, symbol: string, label: string, unit: string, min: ParameterBound, max: ParameterBound, flags: EntryFlags = {}): CatalogueEntry => ({
  path,
  symbol,
  label,
  unit,
  integer: flags.integer ?? false,
  min,
  max,
  group: groupOf(path),
  editable: flags.editable ?? false,
  fittable: flags.fittable ?? false,
});

const TIME_AFTER_HORIZON = 'a time after the longest horizon (3600 s) never acts in a run';
const TORQUE_MAX = 'more than 1e9 N·m is a thousand times the torque of the largest industrial drives';

export const PARAMETER_CATALOGUE: readonly CatalogueEntry[] = [
  entry('joint.inertia', 'J', 'Inertia', 'kg·m²', positive('a joint without inertia has no motion to simulate'), atMost(1e6, 'inertia above 1e6 kg·m² (a 20 t disc 10 m across) is no machine axis: check the unit (g·cm² is 1e-7 kg·m²)'), { editable: true, fittable: true }),
  entry('joint.damping', 'b', 'Damping', 'N·m·s/rad', atLeast(-1e9, 'damping below −1e9 N·m·s/rad is no joint (negative damping, a drive model feeding energy in, is allowed but makes the plant unstable)'), atMost(1e9, 'damping above 1e9 N·m·s/rad would stop even a 1e6 kg·m² axis within a millisecond: no joint has it'), { editable: true, fittable: true }),
  entry('joint.stiffness', 'k', 'Stiffness', 'N·m/rad', atLeast(-1e12, 'stiffness below −1e12 N·m/rad is no joint (negative stiffness, a load pushing away from rest such as gravity on a link above horizontal, is allowed but makes the plant unstable)'), atMost(1e12, 'a solid steel shaft 1 m thick and 10 cm long is about 1e11 N·m/rad; above 1e12 nothing flexes'), { editable: true, fittable: true }),
  entry('joint.gearRatio', 'N', 'Gear ratio', '', positive('a gear ratio is a positive factor (direction belongs to the sign of the gains)'), atMost(1e5, 'strain-wave and worm gearing reach about 1e4; above 1e5 is no drive train'), { editable: true }),
  entry('controller.kp', 'k_p', 'Proportional gain', 'N·m/rad', nonNegative('a negative gain pushes the joint away from its reference'), atMost(1e8, 'kp above 1e8 N·m/rad is no joint’s gain: the largest axis (1e6 kg·m²) at a 10 rad/s bandwidth needs J·ω² = 1e8'), { editable: true }),
  entry('controller.ki', 'k_i', 'Integral gain', 'N·m/(rad·s)', nonNegative('a negative gain pushes the joint away from its reference'), atMost(1e9, 'ki above 1e9 N·m/(rad·s) is no joint’s gain: the largest kp (1e8) times a 10 rad/s bandwidth is 1e9'), { editable: true }),
  entry('controller.kd', 'k_d', 'Derivative gain', 'N·m·s/rad', nonNegative('a negative gain pushes the joint away from its reference'), atMost(1e7, 'kd above 1e7 N·m·s/rad is no joint’s gain: critically damping the largest axis (1e6 kg·m²) at 5 rad/s needs 2·J·ω = 1e7'), { editable: true }),
  entry('controller.derivativeFilter', 'T_f', 'Derivative filter', 's', nonNegative('a time constant cannot be negative (0 means unfiltered)'), atMost(10, 'a derivative filter slower than 10 s removes the derivative action from any joint'), { editable: true }),
  entry('controller.samplePeriod', 'T_s', 'Sample period', 's', atLeast(1e-7, 'no drive samples faster than 10 MHz (0.1 µs); the fastest current loops run near 1 µs'), atMost(1, 'a controller sampling less than once a second cannot hold a joint')),
  entry('initial.angle', 'θ₀', 'Initial angle', 'rad', atLeast(-1e5, 'more than 1e5 rad (16,000 turns) from zero is a unit slip, near the twin’s runaway bound'), atMost(1e5, 'more than 1e5 rad (16,000 turns) from zero is a unit slip, near the twin’s runaway bound'), { editable: true }),
  entry('initial.velocity', 'ω₀', 'Initial velocity', 'rad/s', atLeast(-1e6, 'the fastest spindles turn at about 1e4 rad/s; 1e6 rad/s is no joint'), atMost(1e6, 'the fastest spindles turn at about 1e4 rad/s; 1e6 rad/s is no joint'), { editable: true }),
  entry('inputs[].amplitude', 'A', 'Amplitude', 'rad or N·m', atLeast(-1e9, `${TORQUE_MAX} (or 1e9 rad of reference)`), atMost(1e9, `${TORQUE_MAX} (or 1e9 rad of reference)`), { editable: true }),
  entry('inputs[].delay', 't₀', 'Start time', 's', nonNegative('a term cannot start before the run does'), atMost(HOUR, TIME_AFTER_HORIZON), { editable: true }),
  entry('inputs[].width', 'w', 'Pulse width', 's', positive('a pulse of no width does nothing'), atMost(HOUR, 'a pulse longer than the longest horizon (3600 s) is a step'), { editable: true }),
  entry('inputs[].frequency', 'ω', 'Angular frequency', 'rad/s', positive('a frequency of zero is a constant: use a step'), atMost(1e7, 'no joint responds above 1e7 rad/s (1.6 MHz)'), { editable: true }),
  entry('inputs[].rate', 'λ', 'Decay rate', '1/s', nonNegative('a negative rate grows without bound instead of decaying'), atMost(1e7, 'a decay faster than 1e7 /s (0.1 µs) is over before any joint moves: use an impulse'), { editable: true }),
  entry('recordedInputs[].delay', 't_d', 'Input delay', 's', nonNegative('a logged input cannot act on the joint before it was logged'), atMost(HOUR, TIME_AFTER_HORIZON), { fittable: true }),
  entry('horizon', 't_end', 'Horizon', 's', positive('a run needs some time to simulate'), atMost(HOUR, 'longer runs belong in a batch job, not a bench'), { editable: true }),
  entry('limits.overshootPercent', 'M_p', 'Overshoot limit', '%', nonNegative('overshoot is measured as zero or more'), atMost(1000, 'an allowed overshoot above 1000 % is no limit at all')),
  entry('limits.settlingTime', 't_s', 'Settling-time limit', 's', positive('no joint settles in no time'), atMost(HOUR, 'a settling time past the longest horizon (3600 s) cannot be checked')),
  entry('limits.steadyStateError', 'e_ss', 'Steady-state error limit', 'rad', nonNegative('an error is measured as its size, zero or more'), atMost(1e5, 'an allowed error of more than 1e5 rad (16,000 turns) is no limit at all')),
  entry('nonlinear.torqueLimit', 'τ_max', 'Torque limit', 'N·m', positive('a drive limited to no torque cannot move the joint (leave the limit out for none)'), atMost(1e9, TORQUE_MAX)),
  entry('nonlinear.coulombFriction', 'τ_c', 'Coulomb friction', 'N·m', nonNegative('friction opposes motion; a negative level would drive it'), atMost(1e9, TORQUE_MAX), { fittable: true }),
  entry('nonlinear.staticFriction', 'τ_s', 'Static friction', 'N·m', nonNegative('friction opposes motion; a negative level would drive it'), atMost(1e9, TORQUE_MAX), { fittable: true }),
  entry('nonlinear.torqueOffset', 'τ_0', 'Torque offset', 'N·m', atLeast(-1e9, TORQUE_MAX), atMost(1e9, TORQUE_MAX), { fittable: true }),
  entry('nonlinear.gravity.mass', 'm', 'Link mass', 'kg', positive('a load without mass has no weight (leave gravity out for none)'), atMost(1e6, 'more than 1000 t on one joint is no robot or machine axis')),
  entry('nonlinear.gravity.arm', 'l', 'Centre-of-mass distance', 'm', positive('a mass on the axis itself has no gravity moment (leave gravity out for none)'), atMost(1000, 'a centre of mass more than 1 km from the axis is a unit slip')),
  entry('nonlinear.gravity.offset', 'φ', 'Gravity offset', 'rad', atLeast(-1000, 'an offset is an angle, normally within ±π; beyond ±1000 rad it is a unit slip'), atMost(1000, 'an offset is an angle, normally within ±π; beyond ±1000 rad it is a unit slip')),
  entry('nonlinear.gravity.acceleration', 'g', 'Gravitational acceleration', 'm/s²', positive('gravity must pull (leave gravity out for none)'), atMost(1000, 'a hundred g (as on a test centrifuge) is the most any joint is tested under')),
  entry('nonlinear.deadBand', 'τ_db', 'Dead band', 'N·m', nonNegative('a dead band is a width, zero or more'), atMost(1e9, TORQUE_MAX)),
  entry('nonlinear.encoderCounts', 'N_enc', 'Encoder resolution', 'counts/rev', positive('an encoder needs at least one count per revolution (leave it out for an exact angle)'), atMost(2 ** 32, 'the twin keeps a 32-bit count register'), { integer: true }),
  entry('nonlinear.noiseStdDev', 'σ', 'Measurement noise', 'rad', nonNegative('a standard deviation is zero or more'), atMost(100, 'noise of more than 100 rad (16 turns) is no measurement')),
  entry('nonlinear.noiseSeed', 'seed', 'Noise seed', '', nonNegative('seeds count from zero'), atMost(2 ** 32 - 1, 'the noise generator keeps a 32-bit state'), { integer: true }),
  entry('run.dt', 'Δt', 'Output spacing', 's', atLeast(0.0005, 'finer than 0.5 ms, a live run sends more samples than a screen can show'), atMost(0.1, 'coarser than 0.1 s, a live run no longer shows the motion')),
];

const byPath = new Map(PARAMETER_CATALOGUE.map((e) => [e.path, e]));

/**
 * The catalogue entry for a path; throws for an unknown path, which is a programming error.
 * @example catalogueEntry('controller.kd').max.value // 1e7
 */
export function catalogueEntry(path: string): CatalogueEntry {
  const found = byPath.get(path);
  if (!found) throw new Error(`no parameter "${path}" in the catalogue`);
  return found;
}

/**
 * The entry for a path of an actual scenario: "inputs.2.delay" is the catalogue's "inputs[].delay".
 * Undefined for a path the catalogue does not hold (text fields, unknown keys).
 * @example catalogueEntryAt('inputs.0.amplitude')?.symbol // 'A'
 */
export function catalogueEntryAt(path: string): CatalogueEntry | undefined {
  return byPath.get(path.replace(/^(inputs|recordedInputs)\.\d+\./, '$1[].'));
}

/**
 * The label a form or table shows: the words, then the symbol as plain text reads it (the
 * catalogue's "k_p" is the README's and LaTeX's subscript; on a form it reads "kp").
 * @example fieldLabel(catalogueEntry('controller.kp')) // "Proportional gain kp"
 */
export function fieldLabel(e: { label: string; symbol: string }): string {
  return e.symbol ? `${e.label} ${e.symbol.replace(/_/g, '')}` : e.label;
}

/** The name a message uses: the path without its block, e.g. "kd", "gravity.mass", "width". */
export function parameterName(e: CatalogueEntry): string {
  const parts = e.path.split('.');
  return parts.length === 1 ? parts[0]! : parts.slice(1).join('.');
}

/** 1e7 rather than 10000000: bounds are orders of magnitude, and read as such. */
const fmt = (x: number, integer: boolean) => {
  const abs = Math.abs(x);
  if (integer || abs === 0 || (abs < 1e5 && abs >= 1e-4)) return String(x);
  return x.toExponential().replace('e+', 'e');
};
const withUnit = (x: number, e: CatalogueEntry) => (e.unit ? `${fmt(x, e.integer)} ${e.unit}` : fmt(x, e.integer));

/** One end of the range as messages show it, e.g. "1e7 N·m·s/rad". */
export function boundText(e: CatalogueEntry, end: 'min' | 'max'): string {
  return withUnit(e[end].value, e);
}

/**
 * What is wrong with `x` for this parameter, or null when it is in range. A value that breaks
 * the sign rule gets the plain sign message ("must be positive") before any magnitude.
 * @example rangeViolation(catalogueEntry('controller.kd'), 1e308) // 'kd must be at most 1e7 N·m·s/rad: …'
 */
export function rangeViolation(e: CatalogueEntry, x: number): string | null {
  const name = parameterName(e);
  if (!Number.isFinite(x)) return `${name} must be a finite number`;
  if (e.integer && !Number.isInteger(x)) return `${name} must be a whole number`;
  const { min, max } = e;
  const belowMin = min.inclusive ? x < min.value : x <= min.value;
  if (belowMin) {
    if (min.value === 0) return min.inclusive ? `${name} must be zero or more` : `${name} must be positive`;
    if (min.value > 0 && x <= 0) return `${name} must be positive`;
    return `${name} must be ${min.inclusive ? 'at least' : 'more than'} ${withUnit(min.value, e)}: ${min.reason}`;
  }
  const aboveMax = max.inclusive ? x > max.value : x >= max.value;
  if (aboveMax) return `${name} must be ${max.inclusive ? 'at most' : 'less than'} ${withUnit(max.value, e)}: ${max.reason}`;
  return null;
}

/**
 * The zod number for a catalogued parameter: finite, in range, one message naming the first
 * rule broken. Callers add `.default()`, `.optional()` or `.nullable()` as the field needs.
 * @example z.strictObject({ kd: catalogueNumber('controller.kd').default(0) })
 */
export function catalogueNumber(path: string) {
  const e = catalogueEntry(path);
  const name = parameterName(e);
  return z.number({ error: `${name} must be a finite number` }).superRefine((x, ctx) => {
    const problem = rangeViolation(e, x);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  });
}
