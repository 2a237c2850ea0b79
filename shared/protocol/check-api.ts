import { z } from 'zod';
import { MAX_FREQUENCY, MIN_FREQUENCY } from '../frequency/frequency-grid';
import { catalogueEntry } from '../scenario/parameter-catalogue';
import { scenarioSchema } from '../scenario/scenario-schema';

// The checks API (POST /api/checks): the bench sends its current draft scenario, a worker thread
// on the server runs the superposition check, the shift check, the linear range and the twin
// against the closed form, and the answer comes back as plain JSON. Every number in the answer is
// finite: where a check has no finite figure (a run hit a bound) the figure is null and the
// reason says why.
//
// The answer's types mirror CheckVerdict and LinearRangeResult (shared/checks) field for field
// instead of importing them: those modules import the twin, and through it odex, whose sources
// the app's compiler would then type-check. sim-server/checks/run-checks.ts builds the answer
// from the real results, so the compiler still holds the two together.

/** POST /api/checks body: the scenario to check, as the bench's draft holds it. */
export const checkRequestSchema = z.strictObject({
  scenario: scenarioSchema,
});
export type CheckRequest = z.input<typeof checkRequestSchema>;

/**
 * A superposition or shift verdict as the API sends it: CheckVerdict with `worst` null when the
 * deviation is infinite (a run stopped at a bound, or nothing moved although an effect acted).
 */
export interface CheckVerdictBody {
  pass: boolean;
  /** Largest deviation relative to the peak |angle| of the runs compared (dimensionless), or null when it is infinite. */
  worst: number | null;
  /** Largest relative deviation that still passes. */
  threshold: number;
  /** When the largest deviation occurs, s. */
  worstTime: number;
  /** Why it failed, naming the effect and when; or a line saying it holds. */
  reason: string;
}

/** The linear range as the API sends it (LinearRangeResult's figures for the bench). */
export interface LinearRangeBody {
  /** Largest input scale found to pass (× the scenario's amplitudes), or null when no scale tried passes. */
  scale: number | null;
  /** Smallest passing scale when small inputs fail and large ones pass (friction, a dead band); else null. */
  smallestScale: number | null;
  /** True when every scale up to the largest tried passes (the range may reach further). */
  passesAtMax: boolean;
  /** One line naming where linearity ends and why. */
  summary: string;
  /** Smallest and largest input scale the search tried. */
  triedScales: [number, number];
}

/** Twin minus closed form over the horizon, or why the closed form could not be compared. */
export type ClosedFormResidualBody =
  | {
      available: true;
      /** Root mean square of twin − closed form, rad. */
      rms: number;
      /** Largest |twin − closed form|, rad. */
      max: number;
      /** When the largest difference occurs, s. */
      timeOfMax: number;
      /** max / peak |closed-form angle| (dimensionless), or null when the closed form stays at 0 and the twin does not. */
      relativeMax: number | null;
      /** Why the twin run stopped before its horizon, or null when it ran to the end. */
      twinStop: string | null;
    }
  | {
      available: false;
      /** Why there is no closed form to compare with, as a sentence. */
      reason: string;
    };

/** POST /api/checks answer (200). */
export interface CheckResponse {
  superposition: CheckVerdictBody;
  shift: CheckVerdictBody;
  linearRange: LinearRangeBody;
  twinVsClosedForm: ClosedFormResidualBody;
  /** Wall time the checks took in the worker thread, ms (waiting for a free worker not included). */
  elapsedMs: number;
}

/** Most frequencies one measured sweep may hold over the API: each is a full twin run. */
export const MAX_SWEEP_POINTS_API = 40;
/** Largest injected amplitude, rad or N·m: the catalogue's bound on input amplitudes. */
export const MAX_SWEEP_AMPLITUDE = catalogueEntry('inputs[].amplitude').max.value;

const frequencyBound = (what: string) =>
  z
    .number({ error: `${what} must be a number of rad/s` })
    .min(MIN_FREQUENCY, { error: `${what} must be at least ${MIN_FREQUENCY} rad/s` })
    .max(MAX_FREQUENCY, { error: `${what} must be at most ${MAX_FREQUENCY} rad/s` });

/** POST /api/checks/sine-sweep body: measure the twin's frequency response by injected sines. */
export const sineSweepRequestSchema = z
  .strictObject({
    scenario: scenarioSchema,
    /** Log-spaced frequencies, rad/s, both ends included. */
    from: frequencyBound('from'),
    to: frequencyBound('to'),
    points: z.int({ error: 'points must be a whole number' }).min(1, { error: 'points must be at least 1' }).max(MAX_SWEEP_POINTS_API, { error: `points must be at most ${MAX_SWEEP_POINTS_API}: each is a full twin run` }),
    /** Default: the reference in closed loop, the torque in open loop. */
    channel: z.enum(['reference', 'torque'], { error: 'channel must be "reference" or "torque"' }).optional(),
    /** Default: the largest amplitude of the scenario's own terms on the channel, else 1. */
    amplitude: z.number({ error: 'amplitude must be a number' }).positive({ error: 'amplitude must be positive' }).max(MAX_SWEEP_AMPLITUDE, { error: `amplitude must be at most ${MAX_SWEEP_AMPLITUDE}` }).optional(),
  })
  .refine((b) => (b.points === 1 ? b.to >= b.from : b.to > b.from), { path: ['to'], error: 'to must be above from (one point is measured at from)' });
export type SineSweepRequest = z.input<typeof sineSweepRequestSchema>;

/** One measured frequency as the API sends it (MeasuredPoint of shared/frequency, field for field). */
export interface MeasuredPointBody {
  frequency: number;
  magnitudeDb: number | null;
  phaseDeg: number | null;
  distortion: number | null;
  saturated: boolean;
  stuck: boolean;
  reason: string | null;
}

/** POST /api/checks/sine-sweep answer (200). */
export interface SineSweepResponse {
  channel: 'reference' | 'torque';
  amplitude: number;
  points: MeasuredPointBody[];
  elapsedMs: number;
}

/** POST /api/checks/operating-range body: linearize about an angle and find how far that holds. */
export const operatingRangeRequestSchema = z.strictObject({
  scenario: scenarioSchema,
  /** θ0, rad. */
  angle: z.number({ error: 'angle must be a number of rad' }),
  holding: z.enum(['feed-forward', 'disturbance'], { error: 'holding must be "feed-forward" or "disturbance"' }).default('feed-forward'),
  /** Agreement as a fraction of the peak, e.g. 0.01. */
  tolerance: z.number({ error: 'tolerance must be a number' }).gt(0, { error: 'tolerance must be above 0' }).lt(1, { error: 'tolerance must be below 1 (0.01 is 1 %)' }).default(0.01),
});
export type OperatingRangeRequest = z.input<typeof operatingRangeRequestSchema>;

/** POST /api/checks/operating-range answer (200): the linear model and how far it holds. */
export interface OperatingRangeResponse {
  /** The linear model about θ0 as a scenario document (angles from θ0). */
  linear: unknown;
  effectiveStiffness: number;
  holdingTorque: number;
  notes: string[];
  /** Null when the scenario has no inputs to grow. */
  range: { tolerance: number; scale: number | null; smallestScale: number | null; largestMove: number | null; checks: number; summary: string } | null;
  elapsedMs: number;
}
