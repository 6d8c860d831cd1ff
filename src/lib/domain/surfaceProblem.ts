/**
 * A study's problem on a fit of several inputs (grid or scattered), as the
 * optimizers see it: value, gradient and Hessian from one evaluation; bounds
 * per input; the data's box as the domain; constraints `other output ≤ / ≥ / =
 * value` from fits of those outputs made with the same method; and kinkAt true
 * on a grid line where a partial derivative jumps (measured by the surface
 * smoothness audit, not assumed from the method).
 */
import { auditSurfaceSmoothness } from '../numerics/audit/surfaceAudit';
import { TensorGrid } from '../numerics/fits/tensorGrid';
import { FitError } from '../numerics/fits/fitError';
import type { SurfaceFit } from '../numerics/fits/surfaceTypes';
import type { Constraint, Objective, Problem } from '../numerics/optimize/types';
import type { ConstraintOp, ProblemSpec } from './problem';

const OP_LABEL: Record<ConstraintOp, string> = { '<=': '≤', '>=': '≥', '=': '=' };

function toArrays(h: Float64Array, n: number): number[][] {
	return Array.from({ length: n }, (_, i) => Array.from(h.subarray(i * n, i * n + n)));
}

/** Per input, sorted grid values where the slope along that input jumps (empty for scattered fits). */
export function surfaceKinks(fit: SurfaceFit): number[][] {
	if (!(fit instanceof TensorGrid)) return Array.from({ length: fit.dimension }, () => []);
	return auditSurfaceSmoothness(fit).kinkLines;
}

export function surfaceConstraint(fit: SurfaceFit, c: ProblemSpec['constraints'][number]): Constraint {
	const sign = c.op === '>=' ? -1 : 1;
	const n = fit.dimension;
	const g = new Float64Array(n);
	return {
		kind: c.op === '=' ? 'eq' : 'ineq',
		label: `${c.output} ${OP_LABEL[c.op]} ${c.value}`,
		evaluate: (x) => {
			const f = fit.valueGradient(x, g);
			return { value: sign * (f - c.value), grad: Array.from(g, (v) => sign * v) };
		},
		...(fit.valueRounding ? { rounding: fit.valueRounding() } : {})
	};
}

export function surfaceProblem(fit: SurfaceFit, constraintFits: SurfaceFit[], spec: ProblemSpec, kinks: number[][] = surfaceKinks(fit)): Problem {
	const n = fit.dimension;
	if (spec.bounds.length !== n) throw new FitError('shape-mismatch', `the study gives bounds for ${spec.bounds.length} inputs; the fit has ${n}`);
	if (constraintFits.length !== spec.constraints.length) throw new FitError('shape-mismatch', `${spec.constraints.length} constraints but ${constraintFits.length} fits of their outputs`);
	constraintFits.forEach((cf, i) => {
		if (cf.dimension !== n) throw new FitError('shape-mismatch', `constraint on ${spec.constraints[i].output}: its fit has ${cf.dimension} inputs; the objective has ${n}`);
	});
	const tol = fit.domain.map(([lo, hi]) => 1e-6 * (hi > lo ? hi - lo : 1));
	const objective: Objective = {
		n,
		evaluate: (x) => {
			const j = fit.evaluate(x);
			return { f: j.f, grad: Array.from(j.grad), hess: toArrays(j.hess, n), outside: j.outside };
		},
		bounds: spec.bounds,
		domain: fit.domain,
		refuseOutside: fit.extrapolation === 'refuse',
		constraints: spec.constraints.map((c, i) => surfaceConstraint(constraintFits[i], c)),
		kinkAt: (x) => kinks.some((lines, k) => lines.some((v) => Math.abs(v - x[k]) <= tol[k])),
		// the fit's own rounding level, where a few ulps of |f| would underrate it (radial-basis sums)
		...(fit.valueRounding ? { fRounding: fit.valueRounding() } : {})
	};
	return { kind: spec.kind, ...(spec.kind === 'solve' ? { target: spec.target } : {}), objective };
}
