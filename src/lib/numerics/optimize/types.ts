/**
 * The contract between the optimizers and their callers (the study engine).
 * Plain TypeScript: no DOM, server or framework imports under src/lib/numerics.
 *
 * Conventions
 * - Inequality constraints read `value ≤ 0`; equality constraints `value = 0`.
 * - `maximize` is run as `minimize −f`; the path and the result report the
 *   user's f and ∇f, the merit column is the quantity the optimizer decreased.
 * - Counting (the same rule for every optimizer): each call of
 *   `Objective.evaluate` counts one `f`; it also counts one `grad` the first
 *   time the optimizer reads that call's gradient, and one `hess` the first time
 *   it reads that call's Hessian. Nelder–Mead reads no gradients, so it
 *   reports `grad: 0`. Evaluations made by the end-of-run second-order check
 *   count too.
 */

export type OptimizerName = 'sqp' | 'bfgs' | 'conjugate-gradient' | 'steepest-descent' | 'nelder-mead' | 'newton';

import type { Outcome } from '../../domain/outcomes';
export type { Outcome };

export type ProblemKind = 'minimize' | 'maximize' | 'solve';

/** What the objective returns at one point: value and derivatives together. */
export interface Evaluation {
	f: number;
	grad: number[];
	/** n×n; null/absent where the method does not define it */
	hess?: number[][] | null;
	/** true when x lay outside the data and an extrapolation rule was applied */
	outside?: boolean;
}

interface ConstraintValue {
	value: number;
	grad: number[];
}

export interface Constraint {
	/** `ineq`: value(x) ≤ 0; `eq`: value(x) = 0 */
	kind: 'ineq' | 'eq';
	evaluate(x: number[]): ConstraintValue;
	/** shown in reasons, e.g. "thrust ≥ 120" */
	label?: string;
	/**
	 * The absolute rounding level of `value`, where the fit knows it exceeds a
	 * few units in the last place of |value| (see `Objective.fRounding`).
	 */
	rounding?: number;
}

export interface Objective {
	/** number of inputs */
	n: number;
	evaluate(x: number[]): Evaluation;
	/** box on the inputs; ±Infinity for an open side */
	bounds?: readonly (readonly [number, number])[];
	constraints?: readonly Constraint[];
	/** the data's range per input; evaluations outside it are counted */
	domain?: readonly (readonly [number, number])[];
	/**
	 * true when the fit's extrapolation rule is `refuse`: an evaluation that
	 * comes back with `outside: true` ends the run as `left-domain`. An
	 * evaluation that throws outside `domain` (or anywhere, when no domain is
	 * given) also ends it as `left-domain`.
	 */
	refuseOutside?: boolean;
	/** true when x sits on a knot where f′ jumps (from the fit's knots and smoothness audit) */
	kinkAt?: (x: number[]) => boolean;
	/**
	 * The absolute rounding level of f over the domain, where the fit knows it
	 * exceeds a few units in the last place of |f|: a value summed from large
	 * terms that cancel (a radial-basis fit: about ε·Σ|c_j φ_j(x)|, which can be
	 * 1e5 times ε|f| near a minimum). The optimizers take differences of f below
	 * it as rounding, not as information (line searches, f-change tests, probes).
	 */
	fRounding?: number;
}

export interface Problem {
	kind: ProblemKind;
	/** for `solve`: the value f(x) must reach */
	target?: number;
	objective: Objective;
}

export interface IterationRecord {
	iteration: number;
	x: number[];
	f: number;
	grad: number[];
	step: number;
	violation: number;
	merit: number;
	active: string[];
}

export interface OptimizeOptions {
	/** first-order stop: ‖projected ∇f‖∞ (or the KKT stationarity and complementarity) ≤ gradTol·max(1, ‖∇f(start)‖∞); values below 1e-15 are raised to it (noted) */
	gradTol?: number;
	/** no-progress stop: a step ‖Δx‖∞ ≤ stepTol·(1 + ‖x‖∞); Nelder–Mead: simplex diameter for convergence */
	stepTol?: number;
	/** no-progress stop: |Δf| ≤ fTol·max(1, |f(start) − f|) + f's rounding level on three successive iterations in which ‖projected ∇f‖ does not halve; Nelder–Mead: spread of f over the simplex, against the same scale */
	fTol?: number;
	/** largest constraint violation accepted at a converged point (absolute) */
	feasTol?: number;
	/** `solve` problems: |f − target| ≤ residualTol·max(1, |f(start) − target|) plus the target's rounding level */
	residualTol?: number;
	maxIterations?: number;
	maxEvaluations?: number;
	maxMilliseconds?: number;
	/** milliseconds; defaults to globalThis.performance.now, else Date.now */
	clock?: () => number;
	/** called after every accepted iteration (and once for the start); return false to stop the run */
	onIteration?: (record: IterationRecord) => void | boolean;
	/** end-of-run check that a converged minimizer is not a maximum or saddle (default true) */
	secondOrderCheck?: boolean;
}

/** The iterates of a run, column-wise (what `GET /runs/:id/path` serves, plus merit and active set). */
export interface Path {
	x: number[][];
	f: number[];
	grad: number[][];
	/** ‖x_k − x_{k−1}‖₂ (0 for the start) */
	step: number[];
	/** largest constraint violation (0 without constraints) */
	violation: number[];
	/**
	 * what the optimizer decreased: f (−f when maximizing; ½(f − target)² for
	 * `solve` by an optimizer other than Newton), plus the SQP penalty terms;
	 * Newton `solve`: |f − target| (one input) or max |rᵢ| (a system)
	 */
	merit: number[];
	/** active constraints: `c<i>` (constraint i), `lo<j>` / `hi<j>` (bound on input j); SQP reports its QP's active set, the others the bounds x sits on */
	active: string[][];
}

/** SQP's Lagrange multipliers for L = F + Σ λᵢ cᵢ − Σ loⱼ(xⱼ − lowerⱼ) + Σ hiⱼ(xⱼ − upperⱼ), F the minimized objective. */
export interface Multipliers {
	/** per constraint, in `objective.constraints` order: ≥ 0 for `ineq`, any sign for `eq` */
	constraints: number[];
	/** per input, ≥ 0 */
	lower: number[];
	upper: number[];
}

export interface KktResiduals {
	stationarity: number;
	feasibility: number;
	complementarity: number;
}

export interface Evaluations {
	f: number;
	grad: number;
	hess: number;
	/** calls of the constraint set (all constraints at one point count once) */
	constraints: number;
}

export interface RunResult {
	optimizer: OptimizerName;
	kind: ProblemKind;
	outcome: Outcome;
	/** one line: why the run ended */
	reason: string;
	/** the end point is on a knot where f′ jumps (any optimizer, any outcome) */
	atKink: boolean;
	/** the end point lies outside `objective.domain` (the data's range): there the fit is its extrapolation rule */
	outsideData: boolean;
	x: number[];
	/** the user's f at x */
	f: number;
	/** ‖∇f(x)‖₂ of the user's f */
	gradNorm: number;
	/** accepted iterations (path length − 1) */
	iterations: number;
	evaluations: Evaluations;
	/** quasi-Newton matrices reset after a singular, non-finite or non-descent update */
	resets: number;
	/** evaluations at points outside `objective.domain` (or reported outside) */
	outsideEvaluations: number;
	multipliers: Multipliers | null;
	kkt: KktResiduals | null;
	start: number[];
	ms: number;
	/** remarks made on the way (start projected into the bounds, restarts, …) */
	notes: string[];
	path: Path;
}

/** What a caller may pair with what. */
export interface OptimizerCapabilities {
	constraints: boolean;
	bounds: boolean;
	usesGradient: boolean;
	usesHessian: boolean;
	kinds: readonly ProblemKind[];
}
