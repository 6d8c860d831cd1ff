/**
 * One entry point for every optimizer and solver of a study:
 * `optimize(problem, optimizer, options, start)` runs one start and returns
 * the whole run (outcome, reason, end point, counts, path). Each optimizer is
 * also exported under its own name with the same (problem, options, start)
 * signature.
 *
 * Pairing rules (explicit, so the study engine can check before it runs):
 * general constraints need `sqp` (or, as extra equations of a `solve`
 * problem, `newton`); every optimizer accepts bounds. A `solve` problem given
 * to an optimizer other than Newton is run as minimize ½(f − target)², and
 * reports `converged` only when |f − target| meets the residual tolerance.
 */
import { bfgs } from './bfgs';
import { conjugateGradient } from './conjugateGradient';
import { nelderMead } from './nelderMead';
import { newton } from './newton';
import { sqp } from './sqp';
import { steepestDescent } from './steepestDescent';
import type { OptimizeOptions, OptimizerCapabilities, OptimizerName, Problem, RunResult } from './types';

const ALL = ['minimize', 'maximize', 'solve'] as const;

export const OPTIMIZERS: Readonly<Record<OptimizerName, OptimizerCapabilities>> = {
	sqp: { constraints: true, bounds: true, usesGradient: true, usesHessian: false, kinds: ALL },
	bfgs: { constraints: false, bounds: true, usesGradient: true, usesHessian: false, kinds: ALL },
	'conjugate-gradient': { constraints: false, bounds: true, usesGradient: true, usesHessian: false, kinds: ALL },
	'steepest-descent': { constraints: false, bounds: true, usesGradient: true, usesHessian: false, kinds: ALL },
	'nelder-mead': { constraints: false, bounds: true, usesGradient: false, usesHessian: false, kinds: ALL },
	// equality constraints join a `solve` problem's equations; none otherwise
	newton: { constraints: false, bounds: true, usesGradient: true, usesHessian: true, kinds: ALL }
};

const RUNNERS: Record<OptimizerName, (problem: Problem, options: OptimizeOptions, start: number[]) => RunResult> = {
	sqp,
	bfgs,
	'conjugate-gradient': conjugateGradient,
	'steepest-descent': steepestDescent,
	'nelder-mead': nelderMead,
	newton
};

export function optimize(problem: Problem, optimizer: OptimizerName, options: OptimizeOptions, start: number[]): RunResult {
	const run = RUNNERS[optimizer];
	if (!run) throw new RangeError(`unknown optimizer "${optimizer}"`);
	const cs = problem.objective.constraints ?? [];
	if (cs.length && !OPTIMIZERS[optimizer].constraints) {
		const eqSolve = optimizer === 'newton' && problem.kind === 'solve';
		if (!eqSolve) throw new RangeError(`${optimizer} does not handle general constraints; use sqp`);
	}
	return run(problem, options, start);
}
