import type { LogSignal, LogUnit } from './log-signals';

/**
 * Which signal a header names, and in which unit, from the words loggers commonly write
 * ("time [ms]", "t_s", "Position (deg)", "enc_counts", "vel_deg/s", "tau Nm", "setpoint").
 * The word lists are common practice of data loggers and drive software, gathered from memory;
 * a header they miss is mapped by the user, who always has the last word.
 */

/** A header cell cut to letters, digits and single spaces, lower-cased, with its unit part removed. */
export function headerWords(header: string): string {
  return header
    .toLowerCase()
    .replace(/[[(].*?[\])]/g, ' ')
    .replace(/°/g, ' deg ')
    .replace(/[^a-z0-9/·*.]+/g, ' ')
    .trim();
}

/** Tried in this order, each on the columns not yet taken: "target angle" is a set-point before it is an angle. */
const SIGNAL_PATTERNS: readonly (readonly [LogSignal, RegExp])[] = [
  ['time', /^(t|time|times|timestamp|time ?stamp|elapsed|seconds|secs?|ms|millis|zeit|tiempo|temps)(\s|$|_)|^time/],
  ['setpoint', /set ?point|(angle|pos\w*) (cmd|ref|des|sp|target)|^sp(\s|$)|target|reference|^ref(\s|$)|desired|demand|command(ed)? (angle|pos)|cmd (angle|pos)|^(q|theta) ?(ref|des|cmd)/],
  ['velocity', /veloc|^vel|speed|omega|angular rate|^rate|^d ?theta|^qd(\s|$)|^w(\s|$)/],
  ['torque', /torque|^tau|moment|effort|^trq/],
  ['angle', /angle|winkel|position|^pos|theta|^q(\s|$)|encoder|^enc|^phi|counts/],
];

/** The signal a header names, or null. */
export function signalOfHeader(header: string): LogSignal | null {
  const words = headerWords(header).replace(/_/g, ' ');
  for (const [signal, pattern] of SIGNAL_PATTERNS) if (pattern.test(words)) return signal;
  return null;
}

/** Unit spellings, each matched as a whole token of the header (in brackets or after _ or a space). */
const UNIT_TOKENS: readonly (readonly [LogUnit, RegExp])[] = [
  ['deg/s', /^(deg\/s|degs?\/sec|°\/s|dps|deg per s)$/],
  ['rad/s', /^(rad\/s|rads?\/sec|rad per s|rps)$/],
  ['ms', /^(ms|msec|millis|milliseconds?)$/],
  ['s', /^(s|sec|secs|seconds?)$/],
  ['deg', /^(deg|degs|degrees?|°)$/],
  ['rad', /^(rad|rads|radians?)$/],
  ['counts', /^(counts?|cnts?|ticks|inc|increments)$/],
  ['N·m', /^(n·m|nm|n\*m|n\.m|n m|newton ?met(er|re)s?)$/],
];

/** Candidate unit texts of a header: bracketed parts first, then the trailing token. */
function unitCandidates(header: string): string[] {
  const lower = header.toLowerCase().trim();
  const found: string[] = [];
  for (const m of lower.matchAll(/[[(]\s*([^\])]*?)\s*[\])]/g)) found.push(m[1]!.trim());
  const bare = lower.replace(/[[(].*?[\])]/g, ' ').trim();
  const parts = bare.split(/[\s_]+/).filter((p) => p.length > 0);
  if (parts.length > 1) found.push(parts[parts.length - 1]!);
  // "vel_deg/s", "theta_deg" and "t_ms" name the unit as the last "_" part; "N m" as the last two words.
  if (parts.length > 2) found.push(parts.slice(-2).join(' '));
  if (bare.endsWith('°')) found.push('°');
  if (/°\/s$/.test(bare)) found.push('°/s');
  return found;
}

/** The unit a header names for a signal, or null when it names none (or one that does not fit the signal). */
export function unitOfHeader(header: string, accepted: readonly LogUnit[]): LogUnit | null {
  for (const candidate of unitCandidates(header)) {
    for (const [unit, pattern] of UNIT_TOKENS) if (accepted.includes(unit) && pattern.test(candidate)) return unit;
  }
  // A header that is only the unit: "ms" for time, "counts" for an encoder.
  const whole = header.toLowerCase().trim();
  for (const [unit, pattern] of UNIT_TOKENS) if (accepted.includes(unit) && pattern.test(whole)) return unit;
  return null;
}
