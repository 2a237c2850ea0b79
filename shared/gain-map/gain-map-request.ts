import { z } from 'zod';
import { AXIS_SPACINGS, MAP_GAINS, MAX_AXIS_POINTS, MIN_AXIS_POINTS } from './gain-axes';

const gainName = z.string({ error: 'gain must be text' }).refine((g) => MAP_GAINS.includes(g), { error: `gain must be one of ${MAP_GAINS.join(', ')}` });
const finite = (what: string) => z.number({ error: `${what} must be a finite number` }).refine(Number.isFinite, { error: `${what} must be a finite number` });

export const axisRequestSchema = z.strictObject({
  gain: gainName,
  min: finite('min'),
  max: finite('max'),
  count: z
    .number({ error: 'count must be a whole number' })
    .int({ error: 'count must be a whole number' })
    .min(MIN_AXIS_POINTS, { error: `count must be at least ${MIN_AXIS_POINTS}` })
    .max(MAX_AXIS_POINTS, { error: `count must be at most ${MAX_AXIS_POINTS}` }),
  spacing: z.enum(AXIS_SPACINGS, { error: 'spacing must be "linear" or "log"' }).default('linear'),
});

export const fixedGainRequestSchema = z.strictObject({ gain: gainName, value: finite('value') });

/**
 * What a gain map is asked for: two swept gains and optionally a third held fixed; every other
 * parameter comes from the scenario. The job engine's route and the CLI both parse with this.
 */
export const gainMapRequestSchema = z.strictObject({
  x: axisRequestSchema,
  y: axisRequestSchema,
  z: fixedGainRequestSchema.nullable().default(null),
});

export type GainMapRequest = z.input<typeof gainMapRequestSchema>;
export type AxisRequest = z.input<typeof axisRequestSchema>;
