/**
 * The parts under the optimizers: the strong-Wolfe line search, the BFGS
 * updates, the QP subproblem on quadprog, and the small linear algebra.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { Run } from '$lib/numerics/optimize/run';
import { wolfeLineSearch } from '$lib/numerics/optimize/wolfeLineSearch';
import { dampedBfgsUpdate, inverseBfgsUpdate } from '$lib/numerics/optimize/quasiNewton';
import { solveQpSubproblem } from '$lib/numerics/optimize/qpSubproblem';
import { luSolve, nullSpaceBasis, symmetricEigen } from '$lib/numerics/optimize/linalg';
import { expectAllClose, expectClose } from '../../reference/tolerance';
import { rosenbrock } from './problems';

const dot = (a: number[], b: number[]) => a.reduce((s, v, i) => s + v * b[i], 0);

describe('strong-Wolfe line search (Nocedal & Wright 2006, Alg. 3.5/3.6)', () => {
	it('returns a step meeting both strong Wolfe conditions along −∇f on Rosenbrock', () => {
		fc.assert(
			fc.property(fc.double({ min: -2, max: 2, noNaN: true }), fc.double({ min: -1, max: 3, noNaN: true }), fc.double({ min: 1e-4, max: 10, noNaN: true }), (x, y, a0) => {
				const run = new Run({ kind: 'minimize', objective: rosenbrock(2) }, 'bfgs', {});
				const p0 = run.evaluate([x, y]);
				const d = p0.grad.map((v) => -v);
				if (Math.hypot(...d) < 1e-8) return;
				const ls = wolfeLineSearch(run, p0, d, { alpha0: a0, alphaMax: Infinity });
				expect(['wolfe', 'armijo']).toContain(ls.status);
				const q = ls.point!;
				const dphi0 = dot(p0.grad, d);
				expect(q.f).toBeLessThanOrEqual(p0.f + 1e-4 * ls.alpha * dphi0 + 1e-12);
				if (ls.status === 'wolfe') expect(Math.abs(dot(q.grad, d))).toBeLessThanOrEqual(0.9 * Math.abs(dphi0) + 1e-12);
			}),
			{ numRuns: 200, seed: 11 }
		);
	});

	it('stops at the bound step when f still falls there', () => {
		const run = new Run({ kind: 'minimize', objective: { n: 1, bounds: [[0, 1]], evaluate: ([x]) => ({ f: -x, grad: [-1] }) } }, 'bfgs', {});
		const ls = wolfeLineSearch(run, run.evaluate([0]), [1], { alpha0: 0.25, alphaMax: 1 });
		expect(ls.status).toBe('bound');
		expect(ls.point!.x).toEqual([1]);
	});

	it('reports nonfinite when every trial is NaN', () => {
		const run = new Run({ kind: 'minimize', objective: { n: 1, evaluate: ([x]) => ({ f: x === 0 ? 0 : NaN, grad: [x === 0 ? -1 : NaN] }) } }, 'bfgs', {});
		expect(wolfeLineSearch(run, run.evaluate([0]), [1], { alpha0: 1, alphaMax: Infinity }).status).toBe('nonfinite');
	});
});

describe('BFGS updates', () => {
	const vec = (n: number) => fc.array(fc.double({ min: -5, max: 5, noNaN: true }), { minLength: n, maxLength: n });

	it('inverse update satisfies the secant equation H⁺y = s when yᵀs > 0, and refuses yᵀs ≤ 0 untouched', () => {
		fc.assert(
			fc.property(vec(3), vec(3), (s, y) => {
				const H = [
					[2, 0.3, 0],
					[0.3, 1, 0.1],
					[0, 0.1, 0.5]
				];
				const before = H.map((r) => r.slice());
				const ok = inverseBfgsUpdate(H, s, y);
				const sy = dot(s, y);
				// (at magnitudes where 1/sᵀy or its square overflows the update is refused too: that is the point)
				const sane = Math.hypot(...s) > 1e-6 && Math.hypot(...y) > 1e-6;
				if (sane && sy > 1e-6 * Math.hypot(...s) * Math.hypot(...y)) {
					expect(ok).toBe(true);
					expectAllClose(H.map((r) => dot(r, y)), s, 1e-8, 'H⁺y = s');
				} else if (sy <= 0) {
					expect(ok).toBe(false);
					expect(H).toEqual(before);
				}
			}),
			{ numRuns: 300, seed: 5 }
		);
	});

	it('damped update (Powell 1978) keeps B positive definite even when sᵀy < 0', () => {
		fc.assert(
			fc.property(vec(3), vec(3), (s, y) => {
				if (Math.hypot(...s) < 1e-3) return;
				const B = [
					[3, 0.5, 0],
					[0.5, 2, 0.2],
					[0, 0.2, 1]
				];
				const res = dampedBfgsUpdate(B, s, y);
				if (!res.ok) return;
				const { values } = symmetricEigen(B);
				expect(values[0]).toBeGreaterThan(0);
			}),
			{ numRuns: 300, seed: 6 }
		);
	});
});

describe('QP subproblem (Goldfarb–Idnani via quadprog, 1-based inside)', () => {
	it('solves min ½‖d‖² − (1, 1)ᵀd s.t. d₁ + d₂ ≤ 1 with multiplier ½', () => {
		// KKT by hand: d = (½, ½), λ = ½
		const r = solveQpSubproblem(
			[
				[1, 0],
				[0, 1]
			],
			[-1, -1],
			[{ kind: 'ineq', value: -1, grad: [1, 1] }],
			[-Infinity, -Infinity],
			[Infinity, Infinity]
		);
		expect(r.status).toBe('ok');
		expectAllClose(r.d, [0.5, 0.5], 1e-14, 'd');
		expectClose(r.lambda[0], 0.5, 1e-14, 'λ');
		expect(r.active).toEqual(['c0']);
	});

	it('handles equalities and bounds with the right multiplier signs', () => {
		// min ½‖d‖² s.t. d₁ + d₂ = 2 (value −2), d₁ ≤ 0.5: d = (0.5, 1.5), λ_eq = −1.5, z_hi = 1
		const r = solveQpSubproblem(
			[
				[1, 0],
				[0, 1]
			],
			[0, 0],
			[{ kind: 'eq', value: -2, grad: [1, 1] }],
			[-Infinity, -Infinity],
			[0.5, Infinity]
		);
		expectAllClose(r.d, [0.5, 1.5], 1e-14, 'd');
		expectClose(r.lambda[0], -1.5, 1e-14, 'λ_eq');
		expectClose(r.zHi[0], 1, 1e-14, 'z_hi');
	});

	it('reports inconsistent constraints as infeasible; the elastic form then minimizes the violation', () => {
		const cons = [
			{ kind: 'ineq' as const, value: 1, grad: [-1] }, // 1 − d ≤ 0 → d ≥ 1
			{ kind: 'ineq' as const, value: 0, grad: [1] } // d ≤ 0
		];
		expect(solveQpSubproblem([[1]], [0], cons, [-Infinity], [Infinity]).status).toBe('infeasible');
		const el = solveQpSubproblem([[1]], [0], cons, [-Infinity], [Infinity], { weights: [10, 10], reg: 1e-8 });
		expect(el.status).toBe('ok');
		// total violation max(0, 1 − d) + max(0, d) ≥ 1, met with equality for d in [0, 1]
		const d = el.d[0];
		expect(Math.max(0, 1 - d) + Math.max(0, d)).toBeCloseTo(1, 6);
	});
});

describe('linear algebra', () => {
	it('luSolve solves and detects singular matrices', () => {
		expectAllClose(luSolve([[0, 2], [1, 1]], [4, 3])!, [1, 2], 1e-15, 'x');
		expect(luSolve([[1, 2], [2, 4]], [1, 2])).toBeNull();
	});
	it('symmetricEigen: A v = λ v', () => {
		const A = [
			[4, 1, 0.5],
			[1, 3, 0.2],
			[0.5, 0.2, -1]
		];
		const { values, vectors } = symmetricEigen(A);
		values.forEach((l, k) => expectAllClose(A.map((r) => dot(r, vectors[k])), vectors[k].map((v) => l * v), 1e-12, `eig ${k}`));
		expect(values[0]).toBeLessThan(values[1]);
	});
	it('nullSpaceBasis is orthonormal and orthogonal to the normals', () => {
		const Z = nullSpaceBasis([[1, 1, 0, 0]], 4);
		expect(Z.length).toBe(3);
		for (const z of Z) {
			expectClose(dot(z, [1, 1, 0, 0]), 0, 1e-14, 'orthogonal');
			expectClose(dot(z, z), 1, 1e-14, 'unit');
		}
	});
});
