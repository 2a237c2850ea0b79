// odex ships its TypeScript source beside the compiled file but no declarations; type-checking
// its source under our strict settings fails, so the part of its API the twin uses is declared
// here. odex 3 (release candidate, pinned exactly): the system is given once, options at
// construction, tables kept between integrations.
declare module 'odex' {
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
