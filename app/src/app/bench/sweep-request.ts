import type { FrequencyGridRequest } from '@kinetwin/shared/frequency/frequency-grid';
import { defaultSweepAmplitude, defaultSweepChannel, largestOwnAmplitude } from '@kinetwin/shared/frequency/sweep-defaults';
import { MAX_SWEEP_AMPLITUDE, MAX_SWEEP_POINTS_API, type SineSweepRequest } from '@kinetwin/shared/protocol/check-api';
import type { InputChannel, Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';
import { DECIMAL } from '@kinetwin/shared/scenario/field-edits';
import { formatQuantity } from './scenario-facts';

/** The channel choice as the form holds it: the server's own default, or one named. */
export type SweepChannelChoice = 'default' | InputChannel;


/** The channel and amplitude a sweep will use for the form's choice, and the server's defaults in words for the labels. */
export interface SweepDefaults {
  channel: InputChannel;
  amplitude: number;
  /** The channel the server picks when none is named, e.g. "reference (closed loop)". */
  channelText: string;
  /** e.g. "0.5 rad, the largest of the scenario's reference terms". */
  amplitudeText: string;
}

/** A sweep ready to post, with what the panel says about it. */
export interface SweepPlan {
  body: SineSweepRequest;
  /** The channel and amplitude the server will use (the defaults where the body says nothing). */
  channel: InputChannel;
  amplitude: number;
  /** The log-spaced grid measured: the panel's, with at most MAX_SWEEP_POINTS_API points. */
  grid: FrequencyGridRequest;
  /** The panel's grid had more points than one sweep may measure. */
  capped: boolean;
}

const unitOf = (channel: InputChannel) => (channel === 'reference' ? 'rad' : 'N·m');

/** The channel and amplitude the server picks when the request names none, for the form's labels (the server's own rule, shared/frequency/sweep-defaults.ts). */
export function sweepDefaultsOf(scenario: Scenario, choice: SweepChannelChoice): SweepDefaults {
  const closedLoop = scenario.controller.mode === 'pid';
  const defaultChannel: InputChannel = defaultSweepChannel(scenario);
  const channel = choice === 'default' ? defaultChannel : choice;
  const largest = largestOwnAmplitude(scenario, channel);
  const amplitude = defaultSweepAmplitude(scenario, channel);
  return {
    channel,
    amplitude,
    channelText: `${defaultChannel} (${closedLoop ? 'closed loop' : 'open loop'})`,
    amplitudeText:
      largest !== null
        ? `${formatQuantity(amplitude, unitOf(channel))}, the largest of the scenario's ${channel} terms`
        : `1 ${unitOf(channel)}: the scenario has no ${channel} term to take it from`,
  };
}

/**
 * The sweep to post for a valid draft on a valid grid, or field errors naming `channel` or
 * `amplitude`. A field left at its default is left out of the body, so the server applies its own
 * rule; an amplitude is a positive plain decimal up to 1e9, as the route requires.
 * @example sweepPlanOf(wrist, { from: 0.1, to: 1000, points: 200 }, 'default', '').value.grid.points // 40
 */
export function sweepPlanOf(scenario: Scenario, grid: FrequencyGridRequest, choice: SweepChannelChoice, amplitudeText: string): Parsed<SweepPlan> {
  const errors: FieldError[] = [];
  if (choice === 'reference' && scenario.controller.mode !== 'pid') errors.push({ field: 'channel', message: 'an open loop has no reference: measure the torque channel' });
  const trimmed = amplitudeText.trim();
  let amplitude: number | undefined;
  if (trimmed !== '') {
    const value = Number(trimmed);
    if (!DECIMAL.test(trimmed) || !Number.isFinite(value)) errors.push({ field: 'amplitude', message: `must be a number, got "${amplitudeText}"` });
    else if (!(value > 0)) errors.push({ field: 'amplitude', message: 'must be positive' });
    else if (value > MAX_SWEEP_AMPLITUDE) errors.push({ field: 'amplitude', message: `must be at most ${MAX_SWEEP_AMPLITUDE}` });
    else amplitude = value;
  }
  if (errors.length > 0) return { ok: false, errors };
  const defaults = sweepDefaultsOf(scenario, choice);
  const points = Math.min(grid.points, MAX_SWEEP_POINTS_API);
  const body: SineSweepRequest = { scenario, from: grid.from, to: grid.to, points };
  if (choice !== 'default') body.channel = choice;
  if (amplitude !== undefined) body.amplitude = amplitude;
  return {
    ok: true,
    value: { body, channel: defaults.channel, amplitude: amplitude ?? defaults.amplitude, grid: { from: grid.from, to: grid.to, points }, capped: grid.points > MAX_SWEEP_POINTS_API },
  };
}
