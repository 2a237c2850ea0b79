import { z } from 'zod';
import { catalogueNumber as num } from './parameter-catalogue';

/**
 * A recorded input: a signal of a stored log replayed as a forcing term, so the twin is driven by
 * exactly what drove the real joint. The scenario keeps only the reference to the log (its id and
 * which signal); the samples themselves are resolved outside shared/ and handed to the twin
 * (shared/twin/recorded-samples.ts), so a scenario document stays small and plain JSON.
 */

/** Logged signals a recorded input may replay (the log's names for them). */
export const RECORDED_SIGNALS = ['torque', 'setpoint'] as const;
export type RecordedSignal = (typeof RECORDED_SIGNALS)[number];

/**
 * How the value runs between two samples: held until the next one (zero-order hold, what a
 * drive does with a sampled command) or along the straight line to it.
 */
export const RECORDED_HOLDS = ['zoh', 'linear'] as const;
export type RecordedHold = (typeof RECORDED_HOLDS)[number];

/** Most recorded inputs one scenario may carry: one per channel, twice over, is plenty. */
export const MAX_RECORDED_INPUTS = 4;
/** Longest log id accepted (ids are the server's; this only bounds what a document may carry). */
export const MAX_LOG_ID_LENGTH = 120;

/** The channel each logged signal drives: a set-point is a reference angle, a torque a torque. */
export const CHANNEL_OF_SIGNAL: Readonly<Record<RecordedSignal, 'reference' | 'torque'>> = { torque: 'torque', setpoint: 'reference' };

export const recordedInputSchema = z
  .strictObject({
    /** reference: angle set-point (closed loop only); torque: torque at the joint. */
    channel: z.enum(['reference', 'torque'], { error: 'channel must be "reference" or "torque"' }),
    /** The stored log the samples come from. */
    logId: z
      .string({ error: 'logId must be text' })
      .trim()
      .min(1, { error: 'logId must not be empty' })
      .max(MAX_LOG_ID_LENGTH, { error: `logId must be at most ${MAX_LOG_ID_LENGTH} characters` }),
    signal: z.enum(RECORDED_SIGNALS, { error: `signal must be one of ${RECORDED_SIGNALS.join(', ')}` }),
    hold: z.enum(RECORDED_HOLDS, { error: `hold must be one of ${RECORDED_HOLDS.join(', ')}` }).default('zoh'),
    /**
     * Dead time between the log's time stamps and the joint, s: the sample logged at time s acts
     * at s + delay (a drive's transport delay, or a clock skew between the logged signals).
     */
    delay: num('recordedInputs[].delay').default(0),
  })
  .superRefine((term, ctx) => {
    if (CHANNEL_OF_SIGNAL[term.signal] !== term.channel) {
      ctx.addIssue({ code: 'custom', path: ['channel'], message: `a ${term.signal} signal drives the ${CHANNEL_OF_SIGNAL[term.signal]} channel` });
    }
  });

export type RecordedInput = z.output<typeof recordedInputSchema>;
