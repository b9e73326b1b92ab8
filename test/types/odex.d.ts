// Minimal typings for the parts of the odex ODE integrator the reference tests use. The package
// ships its TypeScript source next to its JavaScript, which does not pass our strict type check.
declare module 'odex' {
  export type Derivative = (x: number, y: number[]) => number[];
  export enum Outcome {
    Converged = 0,
    MaxStepsExceeded = 1,
    EarlyReturn = 2,
  }
  export class Solver {
    constructor(n: number);
    absoluteTolerance: number | number[];
    relativeTolerance: number | number[];
    initialStepSize: number;
    maxSteps: number;
    denseOutput: boolean;
    solve(f: Derivative, x0: number, y0: number[], xEnd: number, solOut?: unknown): { y: number[]; outcome: Outcome; nStep: number; xEnd: number };
  }
}
