/**
 * A study's problem on one fit, as the optimizers see it: value, f′ and f″
 * from one evaluation of the fitted curve; bounds; the data's range as the
 * domain; `refuse` extrapolation mapped to refuseOutside; constraints
 * `other output ≤ / ≥ / = value` from fits of those outputs made with the
 * same method; and kinkAt from the fit's knots where f′ jumps (measured by the
 * smoothness audit, not assumed from the method).
 */
import { auditSmoothness } from '../numerics/audit/smoothness';
import type { CurveFit } from '../numerics/fits/types';
import type { Constraint, Objective, Problem, ProblemKind } from '../numerics/optimize/types';

export type ConstraintOp = '<=' | '>=' | '=';
export interface ProblemSpec {
	kind: ProblemKind;
	target?: number;
	/** one [lo, hi] per input, always filled in (defaults to the data's range) */
	bounds: [number, number][];
	constraints: { output: string; op: ConstraintOp; value: number }[];
}

/** Interior knots where f′ (or f) jumps by more than the audit's threshold, sorted. */
export function kinksOf(fit: CurveFit): Float64Array {
	if (fit.knots.length < 3) return new Float64Array(0);
	const audit = auditSmoothness(fit, { worst: fit.knots.length });
	const xs = audit.worst.filter((k) => Math.abs(k.jumpD1) > audit.tolerance.d1 || Math.abs(k.jumpF) > audit.tolerance.f).map((k) => k.x);
	return Float64Array.from(xs).sort();
}

/** Is x within `tol` of a sorted list of kinks? (binary search) */
function nearKink(kinks: Float64Array, x: number, tol: number): boolean {
	let lo = 0;
	let hi = kinks.length - 1;
	while (lo <= hi) {
		const mid = (lo + hi) >> 1;
		const d = kinks[mid] - x;
		if (Math.abs(d) <= tol) return true;
		if (d < 0) lo = mid + 1;
		else hi = mid - 1;
	}
	return false;
}

const OP_LABEL: Record<ConstraintOp, string> = { '<=': '≤', '>=': '≥', '=': '=' };

function constraintOf(fit: CurveFit, c: ProblemSpec['constraints'][number]): Constraint {
	const sign = c.op === '>=' ? -1 : 1;
	return {
		kind: c.op === '=' ? 'eq' : 'ineq',
		label: `${c.output} ${OP_LABEL[c.op]} ${c.value}`,
		evaluate: (x) => {
			const j = fit.evaluate(x[0]);
			return { value: sign * (j.f - c.value), grad: [sign * j.df] };
		}
	};
}

export function curveProblem(fit: CurveFit, constraintFits: CurveFit[], spec: ProblemSpec, kinks: Float64Array = kinksOf(fit)): Problem {
	const width = fit.domain[1] - fit.domain[0];
	const tol = 1e-6 * (width > 0 ? width : 1);
	const objective: Objective = {
		n: 1,
		evaluate: (x) => {
			const j = fit.evaluate(x[0]);
			return { f: j.f, grad: [j.df], hess: [[j.d2f]], outside: j.outside };
		},
		bounds: spec.bounds,
		domain: [fit.domain],
		refuseOutside: fit.extrapolation === 'refuse',
		constraints: spec.constraints.map((c, i) => constraintOf(constraintFits[i], c)),
		kinkAt: (x) => nearKink(kinks, x[0], tol)
	};
	return { kind: spec.kind, ...(spec.kind === 'solve' ? { target: spec.target } : {}), objective };
}
