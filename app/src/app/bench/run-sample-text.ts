import type { RunSample } from '@kinetwin/shared/protocol/run-events';
import { formatResult } from './scenario-facts';

/** One labelled value of the scrub readout. */
export interface SampleReading {
  /** Stable key for `track`. */
  key: string;
  label: string;
  value: string;
}

// A value the twin did not send reads as a dash, never as NaN.
function quantity(value: number, unit: string): string {
  return Number.isFinite(value) ? formatResult(value, unit) : '—';
}

/**
 * The scrub readout of one recorded sample: time, angle, velocity, applied torque and the flags.
 * @example sampleReadings({ t: 0.5, angle: 0.25, velocity: -0.1, controllerTorque: 2, appliedTorque: 1.5, saturating: true, sticking: false })[0] // { key: 't', label: 't', value: '0.5 s' }
 */
export function sampleReadings(sample: RunSample): SampleReading[] {
  return [
    { key: 't', label: 't', value: quantity(sample.t, 's') },
    { key: 'angle', label: 'angle', value: quantity(sample.angle, 'rad') },
    { key: 'velocity', label: 'velocity', value: quantity(sample.velocity, 'rad/s') },
    { key: 'appliedTorque', label: 'applied torque', value: quantity(sample.appliedTorque, 'N·m') },
    { key: 'saturating', label: 'saturating', value: sample.saturating ? 'yes' : 'no' },
    { key: 'sticking', label: 'sticking', value: sample.sticking ? 'yes' : 'no' },
  ];
}
