/**
 * Loads the reference ODE integrator odex 2.0.4 (a port of the Fortran ODEX extrapolation code of
 * "Solving Ordinary Differential Equations I: Nonstiff Problems", Springer, 2nd ed. 1993; from memory) for tests.
 *
 * Why not `import odex from 'odex'`: the package ships its TypeScript source beside its main .js and no .d.ts,
 * so a static import makes tsc typecheck node_modules/odex/src/odex.ts, which has strict-mode errors
 * (skipLibCheck only skips .d.ts files). Loading through createRequire with this small local type avoids that.
 */
import { createRequire } from 'node:module';

/** The part of odex's Solver the tests use (see node_modules/odex/src/odex.ts). */
export interface OdexSolver {
  absoluteTolerance: number | number[];
  relativeTolerance: number | number[];
  maxSteps: number;
  solve(
    f: (x: number, y: number[]) => number[],
    x0: number,
    y0: number[],
    x1: number,
  ): { y: number[]; outcome: number; nStep: number; xEnd: number };
}

interface OdexModule {
  Solver: new (n: number) => OdexSolver;
  /** 0 = Converged, 1 = MaxStepsExceeded, 2 = EarlyReturn. */
  Outcome: { Converged: number; MaxStepsExceeded: number; EarlyReturn: number };
}

/** The odex module (CommonJS), typed locally. */
export const odex = createRequire(import.meta.url)('odex') as OdexModule;
