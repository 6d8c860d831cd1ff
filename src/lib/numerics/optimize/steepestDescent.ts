/**
 * Steepest descent, d = −∇f, with the same strong-Wolfe line search as BFGS
 * (c₂ = 0.1, initial step by Nocedal & Wright 2006 eq. 3.60); bounds by
 * projection. A baseline: linear convergence, slow on curved valleys.
 */
import { descend } from './descent';
import { Run } from './run';
import type { OptimizeOptions, Problem, RunResult } from './types';

export function steepestDescent(problem: Problem, options: OptimizeOptions, start: number[]): RunResult {
	return descend(new Run(problem, 'steepest-descent', options, { maxIterations: 5000 }), start, 'steepest-descent');
}
