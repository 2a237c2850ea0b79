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

// odex 3 (release candidate): the system is given once, options at construction, tables kept
// between integrations; the part of its API the twin uses.
declare module 'odex3' {
  export type Derivative = (x: number, y: number[], yp: number[]) => number[] | void;
  export type DenseOutputFunction = (c: number, x: number) => number;
  export interface SolutionSegment {
    x0: number;
    x1: number;
    y: number[];
    f: DenseOutputFunction;
  }
  export interface Options {
    maxSteps: number;
    initialStepSize: number;
    maxStepSize: number;
    maxExtrapolationColumns: number;
    denseOutput: boolean;
    relativeTolerance: number | number[];
    absoluteTolerance: number | number[];
    /** true: f has the signature (x, y, out) => void and writes the rates into out. */
    rawFunction: boolean;
  }
  export class Solver {
    constructor(f: Derivative, n: number, options?: Partial<Options>);
    solutionSegments(x: number, y0: number[], xEnd?: number): Generator<SolutionSegment, undefined>;
  }
}
