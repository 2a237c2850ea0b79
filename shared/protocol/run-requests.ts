import { z } from 'zod';
import { catalogueNumber } from '../scenario/parameter-catalogue';
import { scenarioSchema } from '../scenario/scenario-schema';
import { idField } from './library-api';
import { DEFAULT_RUN_DT, MAX_RUN_SPEED, MIN_RUN_SPEED } from './run-events';

// Runtime validation of live-run requests, apart from the event types so the app's bench can
// import the protocol without pulling zod into its bundle.

const speedSchema = z
  .number({ error: 'speed must be a number' })
  .refine((v) => v === 0 || (v >= MIN_RUN_SPEED && v <= MAX_RUN_SPEED), {
    error: `speed must be 0 (as fast as possible) or between ${MIN_RUN_SPEED} and ${MAX_RUN_SPEED}`,
  });

const runId = z.string({ error: 'runId must be text' }).min(1).max(64);

export const runStartSchema = z
  .strictObject({
    /**
     * Run a stored scenario by id, or the scenario given inline (the bench's unsaved edits). Ids
     * are bounded to PostgreSQL's integer range, so an id the database would refuse is a field error.
     */
    scenarioId: idField('scenarioId').optional(),
    scenario: scenarioSchema.optional(),
    speed: speedSchema.default(1),
    dt: catalogueNumber('run.dt').default(DEFAULT_RUN_DT),
  })
  .refine((r) => (r.scenarioId === undefined) !== (r.scenario === undefined), {
    error: 'give exactly one of scenarioId or scenario',
  });
export type RunStartRequest = z.input<typeof runStartSchema>;

export const runStopSchema = z.strictObject({ runId });
export type RunStopRequest = z.infer<typeof runStopSchema>;

export const runSpeedSchema = z.strictObject({ runId, speed: speedSchema });
export type RunSpeedRequest = z.infer<typeof runSpeedSchema>;

export const runScrubSchema = z.strictObject({ runId, time: z.number({ error: 'time must be a finite number' }).nonnegative({ error: 'time must be zero or more' }) });
export type RunScrubRequest = z.infer<typeof runScrubSchema>;

/**
 * Kicks are the quick disturbances an engineer pokes a live joint with: impulses and steps, at the
 * twin's current time or, with `delay`, at a later simulated time (never one already past).
 */
export const runKickSchema = z.strictObject({
  runId,
  kick: z.strictObject({
    channel: z.enum(['reference', 'torque'], { error: 'channel must be "reference" or "torque"' }),
    shape: z.enum(['impulse', 'step'], { error: 'a kick is an "impulse" (torque only) or a "step"' }),
    amplitude: z.number({ error: 'amplitude must be a finite number' }),
    delay: z.number({ error: 'delay must be a finite number of seconds' }).nonnegative({ error: 'delay must be zero or more' }).optional(),
  }),
});
export type RunKickRequest = z.infer<typeof runKickSchema>;

