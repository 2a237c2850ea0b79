import { z } from 'zod';
import { scenarioSchema } from '../scenario/scenario-schema';
import { DEFAULT_RUN_DT, MAX_RUN_SPEED, MIN_RUN_SPEED } from './run-events';

// Runtime validation of live-run requests, apart from the event types so the app's bench can
// import the protocol without pulling zod into its bundle.

export const runStartSchema = z
  .strictObject({
    /** Run a stored scenario by id, or the scenario given inline (the bench's unsaved edits). */
    scenarioId: z.number().int().positive().optional(),
    scenario: scenarioSchema.optional(),
    speed: z
      .number()
      .refine((v) => v === 0 || (v >= MIN_RUN_SPEED && v <= MAX_RUN_SPEED), {
        error: `speed must be 0 (as fast as possible) or between ${MIN_RUN_SPEED} and ${MAX_RUN_SPEED}`,
      })
      .default(1),
    dt: z.number().min(0.0005, { error: 'dt must be at least 0.0005 s' }).max(0.1, { error: 'dt must be at most 0.1 s' }).default(DEFAULT_RUN_DT),
  })
  .refine((r) => (r.scenarioId === undefined) !== (r.scenario === undefined), {
    error: 'give exactly one of scenarioId or scenario',
  });
export type RunStartRequest = z.input<typeof runStartSchema>;

export const runStopSchema = z.strictObject({ runId: z.string().min(1).max(64) });
export type RunStopRequest = z.infer<typeof runStopSchema>;

