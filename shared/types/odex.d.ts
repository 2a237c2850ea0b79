// odex ships its TypeScript source beside the compiled file but no declarations; type-checking
// its source under our strict settings fails, so the part of its API we use is declared here.
declare module 'odex' {
  export type Derivative = (x: number, y: number[]) => number[];
  export type OutputFunction = (
    nr: number,
    xold: number,
    x: number,
    y: number[],
    dense?: (component: number, x: number) => number,
  ) => boolean | void;
  export enum Outcome {
    Converged = 0,
    MaxStepsExceeded = 1,
    EarlyReturn = 2,
  }
  export interface SolveResult {
    y: number[];
    outcome: Outcome;
    nStep: number;
    xEnd: number;
    nAccept: number;
    nReject: number;
    nEval: number;
  }
  export class Solver {
    constructor(n: number);
    n: number;
    maxSteps: number;
    initialStepSize: number;
    maxStepSize: number;
    denseOutput: boolean;
    /** Most columns of the extrapolation table (odex's default 9). */
    maxExtrapolationColumns: number;
    relativeTolerance: number | number[];
    absoluteTolerance: number | number[];
    solve(f: Derivative, x: number, y0: number[], xEnd: number, solOut?: OutputFunction): SolveResult;
  }
}
