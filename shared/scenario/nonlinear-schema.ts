import { z } from 'zod';
import { catalogueEntry, catalogueNumber as num } from './parameter-catalogue';

/**
 * The scenario's `nonlinear` block: effects the twin adds to the linear joint so it departs from
 * the closed form the way a real joint does. Every field is optional and every effect is off
 * when its field is absent; the defaults live once, in NONLINEAR_DEFAULTS, and the twin reads the
 * block through resolveNonlinear(). The closed form ignores this block.
 *
 * Fields are optional rather than zod defaults because the scenario applies `.default({})` to the
 * whole block, and zod 4 returns such a default without parsing it: defaults inside would not be
 * filled in for a file that omits the block.
 */

/** Finest encoder the twin accepts, counts per revolution (from the parameter catalogue). */
export const MAX_ENCODER_COUNTS = catalogueEntry('nonlinear.encoderCounts').max.value;
/** Largest seed of the noise generator (from the parameter catalogue). */
export const MAX_NOISE_SEED = catalogueEntry('nonlinear.noiseSeed').max.value;

/** The gravity load of a joint that is not horizontal. */
export const gravityLoadSchema = z.strictObject({
  /** Mass of the moving link and payload, kg. */
  mass: num('nonlinear.gravity.mass'),
  /** Distance from the joint axis to the centre of mass, m. */
  arm: num('nonlinear.gravity.arm'),
  /** Angle of the centre of mass from straight down when θ = 0, rad (π/2: horizontal at θ = 0). Default 0. */
  offset: num('nonlinear.gravity.offset').optional(),
  /** Gravitational acceleration, m/s². Default 9.80665 (standard gravity). */
  acceleration: num('nonlinear.gravity.acceleration').optional(),
});

/** The `nonlinear` block (strict: unknown keys are refused). */
export const nonlinearSchema = z
  .strictObject({
    /** Symmetric limit on the drive torque at the joint (N × motor limit), N·m. Default none. */
    torqueLimit: num('nonlinear.torqueLimit').nullable().optional(),
    /** Stop integrating while the drive saturates and the error pushes further into it (clamping). Default true. */
    antiWindup: z.boolean({ error: 'antiWindup must be true or false' }).optional(),
    /** Coulomb (sliding) friction torque at the joint, N·m. Default 0 (off). */
    coulombFriction: num('nonlinear.coulombFriction').optional(),
    /** Breakaway (static) friction torque at the joint, N·m, at least coulombFriction. Default: equal to coulombFriction. */
    staticFriction: num('nonlinear.staticFriction').nullable().optional(),
    /** Gravity load m·g·l·sin(θ + offset). Default none (a horizontal joint). */
    gravity: gravityLoadSchema.nullable().optional(),
    /**
     * Constant torque at the joint, N·m, added to the torque channel from t = 0: a bias in the
     * drive's torque or an unmodelled constant load, as a fit finds it. Default 0 (off).
     */
    torqueOffset: num('nonlinear.torqueOffset').optional(),
    /** Drive dead band at the joint, N·m: drive torques within ±deadBand do not reach the joint. Default 0 (off). */
    deadBand: num('nonlinear.deadBand').optional(),
    /** Sampled controller only: apply each computed torque one sample period late. Default false. */
    computeDelay: z.boolean({ error: 'computeDelay must be true or false' }).optional(),
    /** Encoder resolution, counts per revolution (sampled controller only). Default none (exact angle). */
    encoderCounts: num('nonlinear.encoderCounts')
      .nullable()
      .optional(),
    /** Standard deviation of Gaussian noise on the measured angle, rad (sampled controller only). Default 0 (off). */
    noiseStdDev: num('nonlinear.noiseStdDev').optional(),
    /** Seed of the measurement-noise generator; the same seed gives the same run. Default 1. */
    noiseSeed: num('nonlinear.noiseSeed')
      .optional(),
  })
  .superRefine((block, ctx) => {
    const coulomb = block.coulombFriction ?? 0;
    if (block.staticFriction != null && block.staticFriction < coulomb) {
      ctx.addIssue({
        code: 'custom',
        path: ['staticFriction'],
        message: `staticFriction must be at least coulombFriction (${coulomb} N·m), got ${block.staticFriction}`,
      });
    }
  });

/** A parsed `nonlinear` block, defaults not yet filled in (see resolveNonlinear). */
export type NonlinearBlock = z.output<typeof nonlinearSchema>;

/** The `nonlinear` block with every default filled in; what the twin works from. */
export interface NonlinearSettings {
  /** N·m at the joint, Infinity when off. */
  torqueLimit: number;
  antiWindup: boolean;
  /** N·m */
  coulombFriction: number;
  /** N·m, ≥ coulombFriction. */
  staticFriction: number;
  /** m·g·l, N·m (0 when off). */
  gravityTorque: number;
  /** rad */
  gravityOffset: number;
  /** N·m, on the torque channel. */
  torqueOffset: number;
  /** N·m */
  deadBand: number;
  computeDelay: boolean;
  /** Counts per revolution, 0 when off. */
  encoderCounts: number;
  /** rad */
  noiseStdDev: number;
  noiseSeed: number;
}

/** Defaults of the `nonlinear` block: every effect off. The README's table quotes these. */
export const NONLINEAR_DEFAULTS = {
  torqueLimit: null,
  antiWindup: true,
  coulombFriction: 0,
  /** null: breakaway equals the Coulomb level. */
  staticFriction: null,
  gravity: null,
  gravityOffset: 0,
  /** Standard gravity, m/s² (CGPM 1901, common practice). */
  gravityAcceleration: 9.80665,
  torqueOffset: 0,
  deadBand: 0,
  computeDelay: false,
  encoderCounts: null,
  noiseStdDev: 0,
  noiseSeed: 1,
} as const;

/**
 * Fills in the defaults of a parsed `nonlinear` block.
 * @example resolveNonlinear({ torqueLimit: 2 }).coulombFriction // 0
 */
export function resolveNonlinear(block: NonlinearBlock | undefined): NonlinearSettings {
  const b = block ?? {};
  const coulomb = b.coulombFriction ?? NONLINEAR_DEFAULTS.coulombFriction;
  const g = b.gravity ?? null;
  return {
    torqueLimit: b.torqueLimit ?? Infinity,
    antiWindup: b.antiWindup ?? NONLINEAR_DEFAULTS.antiWindup,
    coulombFriction: coulomb,
    staticFriction: b.staticFriction ?? coulomb,
    gravityTorque: g ? g.mass * (g.acceleration ?? NONLINEAR_DEFAULTS.gravityAcceleration) * g.arm : 0,
    gravityOffset: g ? (g.offset ?? NONLINEAR_DEFAULTS.gravityOffset) : 0,
    torqueOffset: b.torqueOffset ?? NONLINEAR_DEFAULTS.torqueOffset,
    deadBand: b.deadBand ?? NONLINEAR_DEFAULTS.deadBand,
    computeDelay: b.computeDelay ?? NONLINEAR_DEFAULTS.computeDelay,
    encoderCounts: b.encoderCounts ?? 0,
    noiseStdDev: b.noiseStdDev ?? NONLINEAR_DEFAULTS.noiseStdDev,
    noiseSeed: b.noiseSeed ?? NONLINEAR_DEFAULTS.noiseSeed,
  };
}
