// Declarations for the odex package (explicit Gragg–Bulirsch–Stoer extrapolation), imported as
// `#odex` (package.json "imports"). The package ships TypeScript source without declarations, and
// its source does not pass strict type-checking, so only the part we call is declared here.

/** Right-hand side y' = f(x, y); must return a new array of length n. */
export type OdexDerivative = (x: number, y: number[]) => number[];

/**
 * Called after each accepted step (and once at the start with nr = 1, xOld = x).
 * `y` is a fresh copy. Return false to stop the integration (outcome EarlyReturn).
 */
export type OdexObserver = (
  nr: number,
  xOld: number,
  x: number,
  y: number[],
  dense?: (component: number, x: number) => number,
) => boolean | void;

export enum Outcome {
  Converged = 0,
  MaxStepsExceeded = 1,
  EarlyReturn = 2,
}

export interface OdexResult {
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
  uRound: number;
  maxSteps: number;
  initialStepSize: number;
  maxStepSize: number;
  maxExtrapolationColumns: number;
  stepSizeSequence: number;
  stabilityCheckCount: number;
  stabilityCheckTableLines: number;
  denseOutput: boolean;
  denseComponents: number[] | undefined;
  relativeTolerance: number | number[];
  absoluteTolerance: number | number[];
  debug: boolean;
  solve(f: OdexDerivative, x: number, y0: number[], xEnd: number, observer?: OdexObserver): OdexResult;
}
