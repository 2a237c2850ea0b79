import { z } from 'zod';
import { nonlinearSchema } from './nonlinear-schema';
import { catalogueEntry, catalogueNumber as num } from './parameter-catalogue';
import { MAX_RECORDED_INPUTS, recordedInputSchema } from './recorded-input-schema';

/**
 * Kinetwin's scenario file, version 1: one joint, its controller, its initial state and the
 * forcing terms applied to it. SI units throughout, angles in radians. The README documents
 * every field; the numeric ranges and their reasons live in the parameter catalogue.
 */

/** Longest horizon a scenario may ask for, s (from the parameter catalogue). */
export const MAX_HORIZON_S = catalogueEntry('horizon').max.value;
/** Most forcing terms one scenario may carry (kicks included). */
export const MAX_INPUT_TERMS = 64;
export const MAX_NAME_LENGTH = 120;
export const MAX_NOTES_LENGTH = 4000;


export const jointSchema = z.strictObject({
  /** Inertia referred to the joint, kg·m². */
  inertia: num('joint.inertia'),
  /** Viscous damping at the joint, N·m·s/rad. */
  damping: num('joint.damping'),
  /** Torsional stiffness at the joint, N·m/rad. */
  stiffness: num('joint.stiffness'),
  /** Gear ratio N: the joint receives N × motor torque; gains act on joint angle. */
  gearRatio: num('joint.gearRatio').default(1),
});

export const controllerSchema = z.strictObject({
  mode: z.enum(['open-loop', 'pid'], { error: 'mode must be "open-loop" or "pid"' }),
  /** Proportional gain, N·m/rad of motor torque. */
  kp: num('controller.kp').default(0),
  /** Integral gain, N·m/(rad·s). */
  ki: num('controller.ki').default(0),
  /** Derivative gain, N·m·s/rad. */
  kd: num('controller.kd').default(0),
  /** Whether the derivative acts on the error (kicks on reference steps) or on the measured angle. */
  derivativeOn: z.enum(['error', 'measurement'], { error: 'derivativeOn must be "error" or "measurement"' }).default('error'),
  /** Time constant of the first-order filter on the derivative term, s (0 = unfiltered). */
  derivativeFilter: num('controller.derivativeFilter').default(0),
  /** Controller sample period, s, used by the twin only (null = continuous). */
  samplePeriod: num('controller.samplePeriod').nullable().default(null),
});

export const inputShapes = ['impulse', 'step', 'ramp', 'pulse', 'sine', 'cosine', 'decay'] as const;
export type InputShape = (typeof inputShapes)[number];
export const inputChannels = ['reference', 'torque'] as const;
export type InputChannel = (typeof inputChannels)[number];

export const inputTermSchema = z
  .strictObject({
    /** reference: angle set-point (closed loop only); torque: external torque at the joint. */
    channel: z.enum(inputChannels, { error: 'channel must be "reference" or "torque"' }),
    shape: z.enum(inputShapes, { error: `shape must be one of ${inputShapes.join(', ')}` }),
    /** rad or N·m (impulse: N·m·s; ramp: rad/s or N·m/s). */
    amplitude: num('inputs[].amplitude'),
    /** Time at which the term starts, s. */
    delay: num('inputs[].delay').default(0),
    /** Pulse width, s (pulse only). */
    width: num('inputs[].width').optional(),
    /** Angular frequency ω0, rad/s (sine and cosine only). */
    frequency: num('inputs[].frequency').optional(),
    /** Decay rate λ, 1/s (decay only). */
    rate: num('inputs[].rate').optional(),
  })
  .superRefine((term, ctx) => {
    if (term.shape === 'pulse' && term.width === undefined) {
      ctx.addIssue({ code: 'custom', path: ['width'], message: 'width is required for a pulse' });
    }
    if ((term.shape === 'sine' || term.shape === 'cosine') && term.frequency === undefined) {
      ctx.addIssue({ code: 'custom', path: ['frequency'], message: `frequency is required for a ${term.shape}` });
    }
    if (term.shape === 'decay' && term.rate === undefined) {
      ctx.addIssue({ code: 'custom', path: ['rate'], message: 'rate is required for a decay' });
    }
    if (term.shape === 'impulse' && term.channel !== 'torque') {
      ctx.addIssue({ code: 'custom', path: ['channel'], message: 'an impulse is only allowed on the torque channel' });
    }
  });

export const limitsSchema = z.strictObject({
  /** Largest acceptable overshoot of a reference step, %. */
  overshootPercent: num('limits.overshootPercent').nullable().default(null),
  /** Largest acceptable 2 % settling time, s. */
  settlingTime: num('limits.settlingTime').nullable().default(null),
  /** Largest acceptable |steady-state error|, rad. */
  steadyStateError: num('limits.steadyStateError').nullable().default(null),
});

/** Effects the twin adds to the linear joint; defined beside the twin's other settings. */
export { nonlinearSchema };

export const scenarioSchema = z
  .strictObject({
    kind: z.literal('kinetwin/scenario', { error: 'kind must be "kinetwin/scenario"' }),
    version: z.literal(1, { error: 'version must be 1' }),
    name: z
      .string({ error: 'name must be text' })
      .trim()
      .min(1, { error: 'name must not be empty' })
      .max(MAX_NAME_LENGTH, { error: `name must be at most ${MAX_NAME_LENGTH} characters` }),
    notes: z.string({ error: 'notes must be text' }).max(MAX_NOTES_LENGTH, { error: `notes must be at most ${MAX_NOTES_LENGTH} characters` }).default(''),
    joint: jointSchema,
    controller: controllerSchema,
    initial: z.strictObject({ angle: num('initial.angle').default(0), velocity: num('initial.velocity').default(0) }).default({ angle: 0, velocity: 0 }),
    inputs: z.array(inputTermSchema).max(MAX_INPUT_TERMS, { error: `at most ${MAX_INPUT_TERMS} input terms are allowed` }).default([]),
    /**
     * Logged signals replayed as forcing terms (recorded-input-schema.ts). Optional rather than
     * defaulted so every scenario written before them still types; read it as `?? []`.
     */
    recordedInputs: z.array(recordedInputSchema).max(MAX_RECORDED_INPUTS, { error: `at most ${MAX_RECORDED_INPUTS} recorded inputs are allowed` }).optional(),
    /** Simulated time span, s. */
    horizon: num('horizon'),
    limits: limitsSchema.default({ overshootPercent: null, settlingTime: null, steadyStateError: null }),
    nonlinear: nonlinearSchema.default({}),
  })
  .superRefine((s, ctx) => {
    if (s.controller.mode === 'open-loop') {
      s.inputs.forEach((term, i) => {
        if (term.channel === 'reference') {
          ctx.addIssue({ code: 'custom', path: ['inputs', i, 'channel'], message: 'a reference input needs a closed loop (controller.mode "pid")' });
        }
      });
      (s.recordedInputs ?? []).forEach((term, i) => {
        if (term.channel === 'reference') {
          ctx.addIssue({ code: 'custom', path: ['recordedInputs', i, 'channel'], message: 'a recorded set-point needs a closed loop (controller.mode "pid")' });
        }
      });
    }
  });

/** A validated scenario with every default filled in. */
export type Scenario = z.output<typeof scenarioSchema>;
/** What a scenario file may contain before defaults are applied. */
export type ScenarioInput = z.input<typeof scenarioSchema>;
export type InputTerm = Scenario['inputs'][number];
export type { RecordedInput } from './recorded-input-schema';
export type Joint = Scenario['joint'];
export type Controller = Scenario['controller'];
