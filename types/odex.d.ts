// Hand-written declarations for odex 2.0.4, which ships TypeScript source but no .d.ts
// (tsc would otherwise type-check its non-strict source). Mirrors node_modules/odex/src/odex.ts.
export interface Derivative {
  (x: number, y: number[]): number[];
}

export interface OutputFunction {
  (nr: number, xold: number, x: number, y: number[], dense?: (c: number, x: number) => number): boolean | void;
}

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
  maxExtrapolationColumns: number;
  stepSizeSequence: number;
  denseOutput: boolean;
  denseComponents: number[] | undefined;
  relativeTolerance: number | number[];
  absoluteTolerance: number | number[];
  debug: boolean;
  grid(dt: number, out: (xOut: number, yOut: number[]) => unknown): OutputFunction;
  solve(f: Derivative, x: number, y0: number[], xEnd: number, solOut?: OutputFunction): SolveResult;
}
