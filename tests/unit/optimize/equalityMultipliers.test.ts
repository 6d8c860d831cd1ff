/**
 * SQP with equality constraints: the outcome, the end point and the sign of
 * every multiplier, from many starts on both sides of each constraint.
 * The QP library (quadprog) negates an equality row in place when it meets it
 * from one side; our multipliers must come out right either way.
 *
 * References:
 * - Hock & Schittkowski (1981), Test Examples for Nonlinear Programming Codes,
 *   problems 7 and 39: statements, x* and f* as published. Their multipliers
 *   are derived here from stationarity at the published x* (our convention
 *   L = f + Σλᵢhᵢ): HS 7 λ = +1/(2√3) (∇f = (0, −1), ∇h = (0, 2√3));
 *   HS 39 λ₁ = λ₂ = −1 (−1 − 3λ₁ + 2λ₂ = 0, λ₁ − λ₂ = 0).
 * - A one-input case "minimise x² subject to x = 1", stated two ways
 *   (h = x − 1 gives λ = −2; h = 1 − x gives λ = +2): common practice, no source.
 * - SciPy 1.10 SLSQP, run live, for x and f from the same starts.
 * Every `converged` is confirmed by a KKT residual computed here from the
 * problem's own gradients, not by the optimizer's stop test.
 */
import { describe, expect, it } from 'vitest';
import { sqp } from '$lib/numerics/optimize';
import type { Objective } from '$lib/numerics/optimize/types';
import { runScipy } from '../../reference/scipy';

interface EqCase {
	name: string;
	objective: Objective;
	xStar: number[];
	fStar: number;
	lambda: number[];
	starts: number[][];
	/** Python: f, jac, list of eq constraint (fun, jac) */
	py: string;
}

const sqrt3 = Math.sqrt(3);

const CASES: EqCase[] = [
	{
		name: 'x² s.t. x − 1 = 0',
		objective: { n: 1, evaluate: (x) => ({ f: x[0] ** 2, grad: [2 * x[0]] }), constraints: [{ kind: 'eq', label: 'x = 1', evaluate: (x) => ({ value: x[0] - 1, grad: [1] }) }] },
		xStar: [1],
		fStar: 1,
		lambda: [-2],
		starts: [[-3], [-0.5], [0.2], [0.99], [1.01], [2], [7]],
		py: `f = lambda x: x[0]**2
jac = lambda x: np.array([2*x[0]])
eqs = [(lambda x: x[0] - 1, lambda x: np.array([1.0]))]`
	},
	{
		name: 'x² s.t. 1 − x = 0',
		objective: { n: 1, evaluate: (x) => ({ f: x[0] ** 2, grad: [2 * x[0]] }), constraints: [{ kind: 'eq', label: 'x = 1', evaluate: (x) => ({ value: 1 - x[0], grad: [-1] }) }] },
		xStar: [1],
		fStar: 1,
		lambda: [2],
		starts: [[-3], [-0.5], [0.2], [0.99], [1.01], [2], [7]],
		py: `f = lambda x: x[0]**2
jac = lambda x: np.array([2*x[0]])
eqs = [(lambda x: 1 - x[0], lambda x: np.array([-1.0]))]`
	},
	{
		name: 'HS 7',
		objective: {
			n: 2,
			evaluate: (x) => ({ f: Math.log(1 + x[0] ** 2) - x[1], grad: [(2 * x[0]) / (1 + x[0] ** 2), -1] }),
			constraints: [{ kind: 'eq', label: '(1 + x₁²)² + x₂² = 4', evaluate: (x) => ({ value: (1 + x[0] ** 2) ** 2 + x[1] ** 2 - 4, grad: [4 * x[0] * (1 + x[0] ** 2), 2 * x[1]] }) }]
		},
		xStar: [0, sqrt3],
		fStar: -sqrt3,
		lambda: [1 / (2 * sqrt3)],
		// not (2, 2): from there SciPy's SLSQP reaches x* but ends on its iteration limit (status 9), so it cannot serve as the reference
		starts: [[1.5, 1.5], [2, 1], [1.8, 2.2], [-1, 1.5], [0.5, 0.5], [0.2, 1.9], [-0.3, 1.2], [1, 1]],
		py: `f = lambda x: np.log(1 + x[0]**2) - x[1]
jac = lambda x: np.array([2*x[0]/(1 + x[0]**2), -1.0])
eqs = [(lambda x: (1 + x[0]**2)**2 + x[1]**2 - 4, lambda x: np.array([4*x[0]*(1 + x[0]**2), 2*x[1]]))]`
	},
	{
		name: 'HS 39',
		objective: {
			n: 4,
			evaluate: (x) => ({ f: -x[0], grad: [-1, 0, 0, 0] }),
			constraints: [
				{ kind: 'eq', label: 'x₂ − x₁³ − x₃² = 0', evaluate: (x) => ({ value: x[1] - x[0] ** 3 - x[2] ** 2, grad: [-3 * x[0] ** 2, 1, -2 * x[2], 0] }) },
				{ kind: 'eq', label: 'x₁² − x₂ − x₄² = 0', evaluate: (x) => ({ value: x[0] ** 2 - x[1] - x[3] ** 2, grad: [2 * x[0], -1, 0, -2 * x[3]] }) }
			]
		},
		xStar: [1, 1, 0, 0],
		fStar: -1,
		lambda: [-1, -1],
		starts: [[2, 2, 2, 2], [1.5, 0.5, 0.3, -0.4], [0.8, 1.3, -0.2, 0.5], [1.2, 0.9, 0.1, 0.1]],
		py: `f = lambda x: -x[0]
jac = lambda x: np.array([-1.0, 0, 0, 0])
eqs = [(lambda x: x[1] - x[0]**3 - x[2]**2, lambda x: np.array([-3*x[0]**2, 1.0, -2*x[2], 0])),
       (lambda x: x[0]**2 - x[1] - x[3]**2, lambda x: np.array([2*x[0], -1.0, 0, -2*x[3]]))]`
	}
];

/** ‖∇f + Σλᵢ∇hᵢ‖∞ and max|hᵢ| at x, from the problem's own functions. */
function kktResidual(o: Objective, x: number[], lambda: number[]) {
	const r = o.evaluate(x).grad!.slice();
	let feas = 0;
	o.constraints!.forEach((c, i) => {
		const { value, grad } = c.evaluate(x);
		feas = Math.max(feas, Math.abs(value));
		grad.forEach((v, j) => (r[j] += lambda[i] * v));
	});
	return { stationarity: Math.max(...r.map(Math.abs)), feasibility: feas };
}

describe.each(CASES.map((c) => [c.name, c] as const))('%s', (_name, c) => {
	const scipy = runScipy<{ x: number[]; fun: number; status: number }[]>(
		`${c.py}
from scipy.optimize import minimize
out = []
for x0 in data:
    cons = [{'type': 'eq', 'fun': fn, 'jac': jc} for fn, jc in eqs]
    r = minimize(f, np.array(x0, dtype=float), jac=jac, constraints=cons, method='SLSQP', options={'ftol': 1e-10, 'maxiter': 2000})
    out.append({'x': r.x, 'fun': r.fun, 'status': r.status})`,
		c.starts
	);

	it.each(c.starts.map((s, k) => [JSON.stringify(s), k] as const))('from %s: converged at x*, multipliers with the right sign, KKT met independently', (_s, k) => {
		const r = sqp({ kind: 'minimize', objective: c.objective }, {}, c.starts[k]);
		expect(r.outcome, r.reason).toBe('converged');
		r.x.forEach((v, j) => expect(Math.abs(v - c.xStar[j]), `x${j + 1} vs Hock & Schittkowski x*`).toBeLessThan(1e-6));
		expect(Math.abs(r.f - c.fStar)).toBeLessThan(1e-8);
		const lam = r.multipliers!.constraints;
		c.lambda.forEach((v, i) => {
			expect(Math.sign(lam[i]), `sign of λ${i + 1}`).toBe(Math.sign(v));
			expect(Math.abs(lam[i] - v), `λ${i + 1} vs stationarity at the published x*`).toBeLessThan(1e-6);
		});
		const kkt = kktResidual(c.objective, r.x, lam);
		expect(kkt.stationarity).toBeLessThan(1e-6);
		expect(kkt.feasibility).toBeLessThan(1e-8);
		// SciPy SLSQP from the same start, live
		const s = scipy[k];
		expect(s.status, 'SciPy SLSQP status').toBe(0);
		r.x.forEach((v, j) => expect(Math.abs(v - s.x[j]), `x${j + 1} vs SciPy SLSQP`).toBeLessThan(1e-5));
		expect(Math.abs(r.f - s.fun)).toBeLessThan(1e-8);
	});
});
