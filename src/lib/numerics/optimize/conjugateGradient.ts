/**
 * Nonlinear conjugate gradient, Polak–Ribière with β⁺ = max(β, 0) and a
 * strong-Wolfe line search with c₂ = 0.1 (E. Polak, G. Ribière, 1969; Nocedal &
 * Wright, Numerical Optimization, 2nd ed. 2006, §5.2, eq. 5.44–5.45), bounds by
 * projection. The loop, bound handling and stopping rules are those of
 * descent.ts. The direction is restarted along −∇f every n iterations, when
 * the set of inputs held at a bound changes, when β makes it a non-descent
 * direction, and once when its line search fails (counted in `resets`).
 */
import { descend } from './descent';
import { Run } from './run';
import type { OptimizeOptions, Problem, RunResult } from './types';

export function conjugateGradient(problem: Problem, options: OptimizeOptions, start: number[]): RunResult {
	return descend(new Run(problem, 'conjugate-gradient', options, { maxIterations: 5000 }), start, 'conjugate-gradient');
}
