// Hand-written declarations for odex 2.0.4 (Hairer & Wanner's ODEX, Gragg–Bulirsch–Stoer).
export type Derivative = (x: number, y: number[]) => number[];
export type DenseOutput = (component: number, x: number) => number;
export type OutputFunction = (
  step: number,
  xOld: number,
  x: number,
  y: number[],
  dense?: DenseOutput,
) => boolean | void;

export declare enum Outcome {
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

export declare class Solver {
  constructor(n: number);
  n: number;
  absoluteTolerance: number | number[];
  relativeTolerance: number | number[];
  maxSteps: number;
  initialStepSize: number;
  maxStepSize: number;
  maxExtrapolationColumns: number;
  denseOutput: boolean;
  denseComponents: number[] | undefined;
  solve(f: Derivative, x0: number, y0: number[], xEnd: number, solOut?: OutputFunction): SolveResult;
}
