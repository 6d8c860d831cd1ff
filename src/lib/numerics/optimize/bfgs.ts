/**
 * BFGS quasi-Newton method with a strong-Wolfe line search (Nocedal & Wright,
 * Numerical Optimization, 2nd ed. 2006, Algorithm 6.1; line search Algorithms
 * 3.5/3.6), bounds by projection. Loop and bound handling: see descent.ts.
 * An update that would be singular or non-finite (yᵀs ≤ 0 after a truncated
 * or Armijo-only step) resets the inverse Hessian and is counted in `resets`.
 */
import { descend } from './descent';
import { Run } from './run';
import type { OptimizeOptions, Problem, RunResult } from './types';

export function bfgs(problem: Problem, options: OptimizeOptions, start: number[]): RunResult {
	return descend(new Run(problem, 'bfgs', options), start, 'bfgs');
}
