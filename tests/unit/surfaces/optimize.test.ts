/**
 * Studies on surfaces: SQP on grid fits of a tabulated known function.
 * Reference: Rosenbrock's function f = 100(y − x²)² + (1 − x)², minimum f = 0
 * at (1, 1) (H. H. Rosenbrock, 1960, "An automatic method for finding the
 * greatest or least value of a function", The Computer Journal 3(3):175–184;
 * see docs/references.md). Tabulated on an uneven 101 × 101 grid over
 * [−1.5, 1.5] × [−0.5, 3] (no bound holds a KKT point of its own); the smooth fits must bring SQP to (1, 1) within
 * their interpolation error, checked independently (distance to the published
 * optimum, and the fit's own gradient there). grid-linear must end stalled at
 * a kink, on a grid line.
 */
import { describe, expect, it } from 'vitest';
import { fitGrid } from '../../../src/lib/numerics/fits';
import type { GridMethod } from '../../../src/lib/numerics/fits';
import { optimize } from '../../../src/lib/numerics/optimize';
import { surfaceProblem } from '../../../src/lib/domain/surfaceProblem';
import { tabulate, unevenAxis } from './helpers';

const rosen = ([x, y]: number[]) => 100 * (y - x * x) ** 2 + (1 - x) ** 2;
const axes = [unevenAxis(101, -1.5, 1.5, 71), unevenAxis(101, -0.5, 3, 72)];
const values = tabulate(axes, rosen);
const bounds: [number, number][] = [
	[-1.5, 1.5],
	[-0.5, 3]
];
const starts = [
	[-1.2, 1],
	[0.5, 0.5],
	[1.4, 1.9],
	[-0.5, 1.5]
];

describe('SQP on grid fits of the Rosenbrock table (published optimum (1, 1))', () => {
	for (const method of ['grid-cubic-natural', 'grid-cubic-not-a-knot'] as GridMethod[]) {
		it(`${method}: converges to (1, 1) from every start`, () => {
			const fit = fitGrid(method, axes, values);
			const problem = surfaceProblem(fit, [], { kind: 'minimize', bounds, constraints: [] });
			for (const s of starts) {
				const r = optimize(problem, 'sqp', { maxIterations: 300, gradTol: 1e-6 }, s);
				expect(r.outcome, `${method} from ${s}: ${r.reason}`).toBe('converged');
				// independent checks: distance to the published optimum, the fit's own gradient there
				expect(Math.hypot(r.x[0] - 1, r.x[1] - 1), `${method} from ${s} ended at ${r.x}`).toBeLessThan(0.05);
				// the fit's gradient there, recomputed, against the documented test ‖∇f‖∞ ≤ gradTol·max(1, ‖∇f(start)‖∞)
				// (gradTol 1e-6 here), with the start's gradient recomputed too
				const g = fit.evaluate(r.x).grad;
				const g0 = fit.evaluate(s).grad;
				expect(Math.max(Math.abs(g[0]), Math.abs(g[1]))).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(g0[0]), Math.abs(g0[1])));
				expect(r.f).toBeLessThan(0.01);
				expect(r.atKink).toBe(false);
			}
		});
	}
	// The C1 fits (Akima, PCHIP) are less accurate in the narrow curved valley: their interpolation
	// error leaves spurious stationary points along it, so from far starts SQP may converge to one of
	// those (a true stationary point of the fit, checked by its own gradient) instead of (1, 1) —
	// measured here: even from (0.9, 0.7) both stop 0.2–0.4 short of the optimum. A finding about
	// these fits on this table, not a defect of the optimizer.
	for (const method of ['grid-akima', 'grid-pchip'] as GridMethod[]) {
		it(`${method}: every converged run is stationary on the fit; each run descends (the optimum itself is not reached: see above)`, () => {
			const fit = fitGrid(method, axes, values);
			const problem = surfaceProblem(fit, [], { kind: 'minimize', bounds, constraints: [] });
			for (const s of [...starts, [0.9, 0.7], [1.2, 1.3]]) {
				const r = optimize(problem, 'sqp', { maxIterations: 300, gradTol: 1e-6 }, s);
				if (r.outcome === 'converged') {
					// the documented rule: ‖∇f‖∞ ≤ gradTol·max(1, ‖∇f(start)‖∞), measured here on the fit itself
					const g = fit.evaluate(r.x).grad;
					const g0 = fit.evaluate(s).grad;
					expect(Math.max(Math.abs(g[0]), Math.abs(g[1]))).toBeLessThanOrEqual(1.01e-6 * Math.max(1, Math.abs(g0[0]), Math.abs(g0[1])));
				}
				// every run descends on the fit
				expect(r.f).toBeLessThan(fit.value(s));
			}
		});
	}
	it('grid-linear: runs end stalled at a kink, on a grid line', () => {
		const fit = fitGrid('grid-linear', axes, values);
		const problem = surfaceProblem(fit, [], { kind: 'minimize', bounds, constraints: [] });
		let kinked = 0;
		for (const s of starts) {
			const r = optimize(problem, 'sqp', { maxIterations: 300 }, s);
			if (r.outcome === 'stalled' && r.atKink) {
				kinked++;
				const onLine = r.x.some((v, k) => axes[k].slice(1, -1).some((a) => Math.abs(a - v) <= 1e-6 * 3));
				expect(onLine, `x = ${r.x}`).toBe(true);
			}
		}
		expect(kinked).toBeGreaterThanOrEqual(3);
	});
	it('a constraint on another output is honoured (x + y ≥ 2.2 from a plane fitted on the same grid)', () => {
		const fit = fitGrid('grid-cubic-not-a-knot', axes, values);
		const plane = fitGrid('grid-cubic-not-a-knot', axes, tabulate(axes, ([x, y]) => x + y));
		const problem = surfaceProblem(fit, [plane], { kind: 'minimize', bounds, constraints: [{ output: 'sum', op: '>=', value: 2.2 }] });
		const r = optimize(problem, 'sqp', { maxIterations: 300, gradTol: 1e-6 }, [0, 0]);
		expect(r.outcome, r.reason).toBe('converged');
		expect(r.x[0] + r.x[1]).toBeGreaterThanOrEqual(2.2 - 1e-6);
		// the constraint is active (the free optimum (1, 1) violates it): multiplier > 0
		expect(r.multipliers!.constraints[0]).toBeGreaterThan(0);
	});
});
