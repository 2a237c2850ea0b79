import { z } from 'zod';
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
