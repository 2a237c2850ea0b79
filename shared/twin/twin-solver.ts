import { Solver } from 'odex';
import type { TwinSettings } from './twin-settings';

/**
 * odex extrapolation columns (its default is 9). Each step fills tables of size ~2·k², and a
 * sampled loop restarts once per sample: 6 columns cut that cost by a fifth in our measurements
 * while the steps the twin takes (≤ one chunk) never need a higher order.
 */
export const EXTRAPOLATION_COLUMNS = 6;

/** θ′ (and the loop states' rates) at (t, state), written into `rates`. */
export type TwinDerivative = (t: number, state: number[], rates: number[]) => void;

/** The solution inside one accepted step: component c at time t in [xOld, x]. */
export type DenseState = (c: number, t: number) => number;

/**
 * Called after every accepted step over [xOld, x] with the state at x (owned by the solver: copy
 * what you keep) and, for a solver with dense output, the interpolant. Returning false halts.
 */
export type StepObserver = (xOld: number, x: number, state: readonly number[], dense: DenseState | null) => boolean | void;

/** How one stretch ended: at its end, halted by the observer, or out of steps. */
export type StretchOutcome = 'converged' | 'halted' | 'max-steps';

export interface StretchResult {
  outcome: StretchOutcome;
  /** State at `x` (the stretch's end unless halted or out of steps). */
  y: number[];
  /** Where integration stopped, s. */
  x: number;
  /** Steps attempted (odex's count: accepted and rejected). */
  steps: number;
}

/**
 * One odex solver of the twin's system at the run's tolerances, reused for every stretch: odex
 * 3 allocates its tables once per solver, where 2.0 did so on every call — a 1 ms sampled loop
 * restarts 1000 times a simulated second (a third of the every-effect run's time went there).
 */
export interface TwinSolver {
  /**
   * Integrates from (start, y0) to end, never stepping past it, with `initialStep` as the first
   * step (odex starts with at least 1e-4 s and at most half the stretch) and at most `maxSteps`
   * attempted steps. y0 is not modified.
   */
  stretch(start: number, y0: readonly number[], end: number, initialStep: number, maxSteps: number, observe?: StepObserver): StretchResult;
  /**
   * One step straight across [start, end] when odex accepts a step that long, else null (and
   * nothing observed): the stretch then needs `stretch`. odex's own start takes at most half a
   * stretch, so a short smooth stretch (one sample of a 1 ms loop) costs two steps where one
   * meets the same tolerance; the error test of the step is odex's own.
   */
  wholeStep(start: number, y0: readonly number[], end: number): number[] | null;
}

/**
 * A twin solver for `f` on `stateSize` states. A run keeps two: one with the dense interpolant
 * for grid points and regime events, and one without, because building the interpolant costs a
 * stretch that needs neither.
 */
export function createTwinSolver(f: TwinDerivative, stateSize: number, settings: TwinSettings, denseOutput: boolean): TwinSolver {
  const solver = new Solver(f, stateSize, {
    rawFunction: true,
    denseOutput,
    relativeTolerance: settings.relativeTolerance,
    absoluteTolerance: settings.absoluteTolerance,
    maxExtrapolationColumns: EXTRAPOLATION_COLUMNS,
    // The per-stretch bound is checked below (a stretch resumed after a deadline has fewer left);
    // odex's own, which throws, is the backstop for a stretch that only ever rejects.
    maxSteps: settings.maxStepsPerChunk + 1,
  });
  // Two of odex 3's internals, pinned by the exact version and checked by twin-solver.spec.ts:
  // it reads the first step from its options at the start of every integration (the release
  // candidate documents options as fixed), and counts attempted steps, rejections included, in
  // nStep (the bound counts those: a stiff stretch is one that keeps rejecting).
  const internals = solver as unknown as { options: { initialStepSize: number }; nStep: number };
  const options = internals.options;
  const initial = [0];
  initial.length = stateSize;

  const copyIn = (y0: readonly number[]) => {
    for (let c = 0; c < stateSize; c++) initial[c] = y0[c]!;
    return initial;
  };

  return {
    stretch(start, y0, end, initialStep, maxSteps, observe) {
      options.initialStepSize = initialStep;
      let y = copyIn(y0);
      let x = start;
      let steps = 0;
      try {
        for (const segment of solver.solutionSegments(start, initial, end)) {
          steps = internals.nStep;
          y = segment.y;
          x = segment.x1;
          // The bound first: a stretch interrupted at every step must still run out of steps.
          if (steps >= maxSteps && x < end) return { outcome: 'max-steps', y, x, steps };
          if (observe && observe(segment.x0, segment.x1, y, denseOutput ? segment.f : null) === false) {
            return { outcome: 'halted', y, x, steps };
          }
        }
      } catch (error) {
        // odex throws once its own count is spent; the backstop above, reported as our bound.
        if (error instanceof Error && error.message.startsWith('maximum allowed steps')) return { outcome: 'max-steps', y, x, steps: internals.nStep };
        throw error;
      }
      return { outcome: 'converged', y, x: end, steps: internals.nStep };
    },

    wholeStep(start, y0, end) {
      const span = end - start;
      // Asked to reach twice as far, odex's first step may be the whole span (≤ half the interval).
      options.initialStepSize = span;
      for (const segment of solver.solutionSegments(start, copyIn(y0), start + 2 * span)) {
        // The first accepted step: across the span (up to roundoff in x0 + h) or shorter after a
        // rejection, in which case the step is dropped (it never looked past the span's end).
        return segment.x1 >= end - 1e-12 * Math.max(1, Math.abs(end)) ? segment.y : null;
      }
      return null;
    },
  };
}
