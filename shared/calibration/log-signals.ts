/**
 * The signals a logged joint trace may carry and the units each may be logged in. Everything a
 * log yields is in SI (s, rad, rad/s, N·m); the factors that take a logged unit there live here.
 */

/** Time and what may be logged against it. */
export const LOG_SIGNALS = ['time', 'angle', 'velocity', 'setpoint', 'torque'] as const;
export type LogSignal = (typeof LOG_SIGNALS)[number];
/** The signals other than time; a log needs at least one. */
export type MeasuredSignal = Exclude<LogSignal, 'time'>;
export const MEASURED_SIGNALS: readonly MeasuredSignal[] = ['angle', 'velocity', 'setpoint', 'torque'];

export const TIME_UNITS = ['s', 'ms'] as const;
/** Angles and angle set-points: encoder counts need counts per revolution. */
export const ANGLE_UNITS = ['rad', 'deg', 'counts'] as const;
export const VELOCITY_UNITS = ['rad/s', 'deg/s'] as const;
export const TORQUE_UNITS = ['N·m'] as const;

export type TimeUnit = (typeof TIME_UNITS)[number];
export type AngleUnit = (typeof ANGLE_UNITS)[number];
export type VelocityUnit = (typeof VELOCITY_UNITS)[number];
export type TorqueUnit = (typeof TORQUE_UNITS)[number];

/** The unit of each signal as logged. */
export interface LogUnits {
  time: TimeUnit;
  angle: AngleUnit;
  velocity: VelocityUnit;
  setpoint: AngleUnit;
  torque: TorqueUnit;
}
export type LogUnit = LogUnits[LogSignal];

/** Units a column is read in when neither the user nor its header names one: SI. */
export const DEFAULT_LOG_UNITS: Readonly<LogUnits> = { time: 's', angle: 'rad', velocity: 'rad/s', setpoint: 'rad', torque: 'N·m' };

/** The SI unit of each signal, for reports, the CSV download and the app's axes. */
export const SI_UNITS: Readonly<Record<LogSignal, string>> = { time: 's', angle: 'rad', velocity: 'rad/s', setpoint: 'rad', torque: 'N·m' };

/** Units each signal accepts. */
export const UNITS_OF: Readonly<Record<LogSignal, readonly LogUnit[]>> = {
  time: TIME_UNITS,
  angle: ANGLE_UNITS,
  velocity: VELOCITY_UNITS,
  setpoint: ANGLE_UNITS,
  torque: TORQUE_UNITS,
};

/** Largest counts per revolution accepted: beyond 2^32 no encoder exists (from memory: 32-bit absolute encoders are the top end). */
export const MAX_COUNTS_PER_REV = 2 ** 32;

/**
 * The factor that takes a value logged in `unit` to SI, or null when the unit needs counts per
 * revolution and none was given.
 */
export function siFactor(unit: LogUnit, countsPerRev: number | null): number | null {
  switch (unit) {
    case 's':
    case 'rad':
    case 'rad/s':
    case 'N·m':
      return 1;
    case 'ms':
      return 1e-3;
    case 'deg':
    case 'deg/s':
      return Math.PI / 180;
    case 'counts':
      return countsPerRev === null ? null : (2 * Math.PI) / countsPerRev;
  }
}
