import { Solver } from 'odex';
import type { TwinSettings } from './twin-settings';

/**
 * odex extrapolation columns (its default is 9). Each solve allocates tables of size ~2·k², and a
 * sampled loop solves once per sample: 6 columns cut that cost by a fifth in our measurements
 * while the steps the twin takes (≤ one chunk) never need a higher order.
 */
export const EXTRAPOLATION_COLUMNS = 6;

/**
 * An odex solver at the run's tolerances and step budget. A run keeps two: one with the dense
 * interpolant for grid points and regime events, and one without, because building the
 * interpolant costs a stretch that needs neither (a sampled loop at 1 ms with 1 ms output
 * restarts 1000 times a second).
 * @param stateSize integrated states (twin-run.ts gives the layout)
 */
export function createTwinSolver(stateSize: number, settings: TwinSettings, denseOutput: boolean): Solver {
  const solver = new Solver(stateSize);
  if (denseOutput) solver.denseOutput = true;
  solver.relativeTolerance = settings.relativeTolerance;
  solver.absoluteTolerance = settings.absoluteTolerance;
  solver.maxSteps = settings.maxStepsPerChunk;
  solver.maxExtrapolationColumns = EXTRAPOLATION_COLUMNS;
  return solver;
}
