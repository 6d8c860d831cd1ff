/**
 * Scaling f on a box changes no outcome, and a large gradient is never read
 * as stationary.
 *
 * Two defects this guards against (both found on a radial-basis fit scaled by
 * 1e6): the first-order measure ‖x − P(x − ∇f)‖∞ caps each component at the
 * room to its bound (a length), while the tolerance grows with ‖∇f(start)‖∞;
 * with f large enough the cap fell below the tolerance and BFGS reported
 * `converged` at its start. And the SQP subproblem solver (quadprog) judged
 * the same QP with B and g times 1e6 "inconsistent".
 *
 * Reference problems (common practice, no source, minima by hand):
 * - q(x, y) = (x − 0.3)² + 3(y + 0.2)² on [−1, 1]², minimum at (0.3, −0.2),
 *   interior;
 * - the same on [0.5, 1] × [−1, 1], minimum on the bound x = 0.5 at
 *   (0.5, −0.2), with ∂q/∂x = 0.4 > 0 there (the bound's multiplier, sign
 *   checked: the gradient points into the box).
 * Every `converged` is confirmed from the function itself: the gradient at
 * the end point recomputed, and the distance to the known minimum.
 */
import { describe, expect, it } from 'vitest';
import { optimize, type Objective, type OptimizerName } from '$lib/numerics/optimize';

const GRADIENT_OPTIMIZERS: OptimizerName[] = ['sqp', 'bfgs', 'conjugate-gradient', 'steepest-descent', 'newton'];

function scaled(s: number, bounds: [number, number][]): Objective {
	return {
		n: 2,
		bounds,
		evaluate: ([x, y]) => ({
			f: s * ((x - 0.3) ** 2 + 3 * (y + 0.2) ** 2),
			grad: [s * 2 * (x - 0.3), s * 6 * (y + 0.2)],
			hess: [
				[2 * s, 0],
				[0, 6 * s]
			]
		})
	};
}

const cases: { name: string; bounds: [number, number][]; min: [number, number] }[] = [
	{
		name: 'interior minimum',
		bounds: [
			[-1, 1],
			[-1, 1]
		],
		min: [0.3, -0.2]
	},
	{
		name: 'minimum on the bound x = 0.5',
		bounds: [
			[0.5, 1],
			[-1, 1]
		],
		min: [0.5, -0.2]
	}
];

describe('scaling f by up to 1e9 on a box: same outcome, same end point, never converged at a start with a large gradient', () => {
	for (const c of cases) {
		for (const optimizer of GRADIENT_OPTIMIZERS) {
			it(`${optimizer}, ${c.name}`, () => {
				for (const start of [
					[0.9, 0.9],
					[0.95, -0.95]
				]) {
					const results = [1, 1e3, 1e6, 1e9].map((s) => ({ s, r: optimize({ kind: 'minimize', objective: scaled(s, c.bounds) }, optimizer, { maxIterations: 500 }, start) }));
					const base = results[0].r;
					expect(base.outcome, `${optimizer} from ${start}: ${base.reason}`).toBe('converged');
					for (const { s, r } of results) {
						expect(r.outcome, `${optimizer} from ${start}, f × ${s}: ${r.reason}`).toBe(base.outcome);
						// it moved: the start is 0.6 or more from the minimum in x
						expect(r.iterations, `${optimizer} from ${start}, f × ${s}`).toBeGreaterThan(0);
						// the end point against the known minimum and the function's own gradient
						expect(Math.hypot(r.x[0] - c.min[0], r.x[1] - c.min[1]), `${optimizer} from ${start}, f × ${s}: ${r.x}`).toBeLessThan(1e-6);
						const gx = 2 * (r.x[0] - 0.3);
						const gy = 6 * (r.x[1] + 0.2);
						expect(Math.abs(gy)).toBeLessThan(1e-6);
						if (c.min[0] === 0.5) {
							expect(r.x[0]).toBe(0.5);
							expect(gx).toBeGreaterThan(0); // the bound holds the point: ∇f points into the box
						} else expect(Math.abs(gx)).toBeLessThan(1e-6);
					}
				}
			});
		}
	}

	it('SQP on the bound: the reported bound multiplier scales with f and keeps its sign', () => {
		for (const s of [1, 1e6]) {
			const r = optimize({ kind: 'minimize', objective: scaled(s, cases[1].bounds) }, 'sqp', {}, [0.9, 0.9]);
			expect(r.outcome).toBe('converged');
			expect(r.kkt, 'SQP reports its KKT residuals').toBeTruthy();
			// stationarity of the Lagrangian at (0.5, −0.2): ∂f/∂x − z_lo = 0 → z_lo = 0.4·s; the residual is relative to that
			expect(r.kkt!.stationarity).toBeLessThanOrEqual(1e-6 * s);
		}
	});
});
