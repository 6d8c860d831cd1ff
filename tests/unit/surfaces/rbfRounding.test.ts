/**
 * The rounding of a radial-basis value, and outcomes that do not depend on it.
 *
 * An RBF value is a sum of n large terms c_j φ_j(x) that cancel: on a
 * thin-plate fit of a Rosenbrock table its rounding is about 1e-11 where
 * |f| ≈ 0.02, far above a few units in the last place of |f|. An optimizer
 * that takes f's rounding as ε|f| asks its line search for decreases the
 * value cannot show, and ends `stalled` at the optimum on some fits and
 * `converged` on others whose coefficients differ only in rounding. Checks:
 *
 * 1. `valueRounding()` bounds the summation error of the value measured
 *    independently: the plain sum against a compensated (Neumaier) sum of the
 *    same terms (Higham, Accuracy and Stability of Numerical Algorithms, 2nd
 *    ed. 2002, §4.3 — see docs/references.md) — and is not absurdly loose.
 * 2. SQP and BFGS from 50 Latin-hypercube starts give the same outcome on
 *    the fit and on three copies whose coefficients are perturbed by a few
 *    ulps; every `converged` end point is confirmed on the fit itself (its
 *    projected gradient recomputed, checked against central differences of
 *    the value, and its Hessian's eigenvalues), not by the optimizer's test.
 * 3. Invariance: scaling the table by 1e6 scales valueRounding by 1e6 and
 *    changes no outcome (common practice, no source).
 * The reference optimum: Rosenbrock's function, minimum 0 at (1, 1) (H. H.
 * Rosenbrock, The Computer Journal 3(3), 1960); the fit of a coarse 21 × 21
 * table has its own stationary points near it, so the end points are checked
 * on the fit, not against (1, 1).
 */
import { describe, expect, it } from 'vitest';
import { fitScatter, RadialBasis } from '../../../src/lib/numerics/fits';
import type { ScatterMethod } from '../../../src/lib/numerics/fits';
import { optimize } from '../../../src/lib/numerics/optimize';
import { latinHypercubeStarts } from '../../../src/lib/numerics/optimize/starts';
import { surfaceProblem } from '../../../src/lib/domain/surfaceProblem';
import { rng } from './helpers';

const rosen = (x: number, y: number) => 100 * (y - x * x) ** 2 + (1 - x) ** 2;
const bounds: [number, number][] = [
	[-2, 2],
	[-1, 3]
];
const points: number[][] = [];
for (let i = 0; i <= 20; i++) for (let j = 0; j <= 20; j++) points.push([-2 + 0.2 * i, -1 + 0.2 * j]);
const values = points.map(([x, y]) => rosen(x, y));

/** a copy of the fit whose coefficients differ from the original by up to ±2 ulps (relative 4.4e-16) */
function perturbed(fit: RadialBasis, seed: number): RadialBasis {
	const r = rng(seed);
	const json = fit.toJSON() as { coefficients: number[] };
	json.coefficients = json.coefficients.map((c) => c * (1 + (r() - 0.5) * 4 * Number.EPSILON));
	return RadialBasis.fromJSON(json);
}

/** Σ terms by Neumaier's compensated summation (Higham 2002, §4.3) */
function compensatedSum(terms: number[]): number {
	let s = 0;
	let comp = 0;
	for (const t of terms) {
		const u = s + t;
		comp += Math.abs(s) >= Math.abs(t) ? s - u + t : t - u + s;
		s = u;
	}
	return s + comp;
}

/** the value's terms, from the fit's stored pieces (kernels as documented in radialBasisSums.ts) */
function terms(fit: RadialBasis, x: number[]): number[] {
	const json = fit.toJSON() as { lower: number[]; span: number[]; centres: number[]; coefficients: number[]; tail: number[]; options: { epsilon: number } };
	const d = x.length;
	const u = x.map((v, k) => (v - json.lower[k]) / json.span[k]);
	const e2 = json.options.epsilon ** 2;
	const out = [json.tail[0], ...u.map((v, k) => json.tail[k + 1] * v)];
	json.coefficients.forEach((c, j) => {
		let s = 0;
		for (let k = 0; k < d; k++) s += (u[k] - json.centres[j * d + k]) ** 2;
		const phi = fit.method === 'rbf-thin-plate' ? (s === 0 ? 0 : 0.5 * e2 * s * Math.log(e2 * s)) : fit.method === 'rbf-multiquadric' ? -Math.sqrt(1 + e2 * s) : Math.exp(-e2 * s);
		out.push(c * phi);
	});
	return out;
}

/** ‖x − P(x − ∇f)‖∞ on the box, from the fit's own gradient */
function projectedGradient(fit: RadialBasis, x: number[], sign: number): number {
	const g = new Float64Array(2);
	fit.valueGradient(x, g);
	return Math.max(...x.map((v, k) => Math.abs(v - Math.min(bounds[k][1], Math.max(bounds[k][0], v - sign * g[k])))));
}

describe('valueRounding bounds the rounding of the value (checked against a compensated sum)', () => {
	// ε = 12 in scaled inputs keeps the multiquadric and Gaussian systems solvable on this table
	const cases: [ScatterMethod, number][] = [
		['rbf-thin-plate', 1],
		['rbf-multiquadric', 12],
		['rbf-gaussian', 12]
	];
	for (const [method, epsilon] of cases) {
		it(`${method}: |plain − compensated| ≤ valueRounding at 300 points, and valueRounding ≤ 1e4 × the largest error seen`, () => {
			const fit = fitScatter(method, points, values, { epsilon });
			const level = fit.valueRounding();
			expect(level).toBeGreaterThan(0);
			const r = rng(11);
			let worst = 0;
			for (let i = 0; i < 300; i++) {
				const x = [-2 + 4 * r(), -1 + 4 * r()];
				const err = Math.abs(fit.value(x) - compensatedSum(terms(fit, x)));
				expect(err, `at ${x}`).toBeLessThanOrEqual(level);
				worst = Math.max(worst, err);
			}
			expect(worst).toBeGreaterThan(0);
			expect(level / worst).toBeLessThan(1e4);
			// and it is far above a few ulps of |f| near the minimum: the reason it exists
			expect(level).toBeGreaterThan(1e3 * 8 * Number.EPSILON * Math.abs(fit.value([1, 1])));
		});
	}

	it('a fit read back from its file gives the same level', () => {
		const fit = fitScatter('rbf-thin-plate', points, values);
		expect(RadialBasis.fromJSON(fit.toJSON()).valueRounding()).toBe(fit.valueRounding());
	});
});

describe('outcomes on a thin-plate fit do not depend on rounding in its coefficients', () => {
	const fit = fitScatter('rbf-thin-plate', points, values);
	const starts = latinHypercubeStarts(bounds, 50, 7);
	const copies = [fit, perturbed(fit, 1), perturbed(fit, 2), perturbed(fit, 3)];

	for (const optimizer of ['sqp', 'bfgs'] as const) {
		it(`${optimizer}: the same outcome from all 50 starts on the fit and on 3 copies perturbed by ≤ 2 ulps; every converged end point stationary and a minimum on the fit`, () => {
			const outcomes = copies.map((f) => {
				const problem = surfaceProblem(f, [], { kind: 'minimize', bounds, constraints: [] });
				return starts.map((s) => optimize(problem, optimizer, {}, s));
			});
			let converged = 0;
			starts.forEach((s, i) => {
				const seen = outcomes.map((runs) => runs[i].outcome);
				expect(new Set(seen).size, `start ${s}: ${seen.join(', ')} — ${outcomes.map((runs) => runs[i].reason).join(' | ')}`).toBe(1);
				outcomes.forEach((runs, c) => {
					const run = runs[i];
					if (run.outcome !== 'converged') return;
					converged++;
					const f = copies[c];
					// stationary on the fit: the projected gradient, recomputed, and the gradient
					// against central differences of the value (h = 1e-5: truncation ~1e-8, rounding ~1e-6)
					expect(projectedGradient(f, run.x, 1), `start ${s} copy ${c} at ${run.x}`).toBeLessThan(1e-4);
					const g = new Float64Array(2);
					f.valueGradient(run.x, g);
					for (let k = 0; k < 2; k++) {
						const xp = run.x.slice();
						const xm = run.x.slice();
						xp[k] += 1e-5;
						xm[k] -= 1e-5;
						expect(Math.abs((f.value(xp) - f.value(xm)) / 2e-5 - g[k])).toBeLessThan(1e-4);
					}
					// a minimum: the Hessian's eigenvalues at an interior end point are ≥ 0 (2 × 2, closed form)
					const interior = run.x.every((v, k) => v > bounds[k][0] + 1e-6 && v < bounds[k][1] - 1e-6);
					if (interior) {
						const h = f.evaluate(run.x).hess;
						const tr = h[0] + h[3];
						const det = h[0] * h[3] - h[1] * h[2];
						const lmin = tr / 2 - Math.sqrt(Math.max(0, (tr * tr) / 4 - det));
						expect(lmin, `start ${s} at ${run.x}`).toBeGreaterThan(-1e-6 * Math.max(1, Math.abs(tr)));
					}
				});
			});
			// most starts reach a minimum of the fit: the check is not vacuous
			expect(converged).toBeGreaterThanOrEqual(4 * 40);
		});
	}

	it('scaling the table by 1e6 scales valueRounding by 1e6 and changes no SQP outcome', () => {
		const big = fitScatter(
			'rbf-thin-plate',
			points,
			values.map((v) => 1e6 * v)
		);
		expect(big.valueRounding() / fit.valueRounding()).toBeCloseTo(1e6, -3);
		const a = surfaceProblem(fit, [], { kind: 'minimize', bounds, constraints: [] });
		const b = surfaceProblem(big, [], { kind: 'minimize', bounds, constraints: [] });
		for (const s of starts.slice(0, 20)) {
			const ra = optimize(a, 'sqp', {}, s);
			const rb = optimize(b, 'sqp', {}, s);
			expect(rb.outcome, `start ${s}: ${ra.reason} | ${rb.reason}`).toBe(ra.outcome);
			if (ra.outcome === 'converged') expect(Math.hypot(ra.x[0] - rb.x[0], ra.x[1] - rb.x[1])).toBeLessThan(1e-4);
		}
	});
});
