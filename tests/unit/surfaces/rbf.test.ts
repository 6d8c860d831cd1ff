/**
 * Scattered fits against SciPy 1.10's RBFInterpolator (Debian, called live):
 * the same kernel, epsilon, smoothing and degree-1 tail, given the inputs our
 * fit scales to unit range (the scaling is ours, so SciPy gets the scaled
 * points). Values to 1e-9 relative; gradients against central differences of
 * SciPy's values (step 1e-5 of the unit range, so agreement to ~1e-7).
 * Rippa's closed-form leave-one-out (S. Rippa, 1999) is checked against
 * brute force (refitting without each point).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { runScipy } from '../../reference/scipy';
import { expectClose } from '../../reference/tolerance';
import { FitError, fitScatter } from '../../../src/lib/numerics/fits';
import type { ScatterMethod, SurfaceFitOptions } from '../../../src/lib/numerics/fits';
import { rng } from './helpers';

function cloud(n: number, d: number, seed: number, f: (x: number[]) => number) {
	const r = rng(seed);
	const lo = Array.from({ length: d }, (_, k) => -2 + k);
	const span = Array.from({ length: d }, (_, k) => 3 + 2 * k);
	const x = Array.from({ length: n }, () => lo.map((l, k) => l + span[k] * r()));
	const probes = Array.from({ length: 8 }, () => lo.map((l, k) => l + span[k] * (0.1 + 0.8 * r())));
	return { x, y: x.map(f), probes, lo, span };
}

interface Setup {
	name: string;
	method: ScatterMethod;
	kernel: string;
	options: SurfaceFitOptions;
	set: ReturnType<typeof cloud>;
}

const SETS = {
	'2-D': cloud(40, 2, 1, ([a, b]) => Math.sin(a) + 0.5 * b * b),
	'3-D': cloud(60, 3, 2, ([a, b, c]) => Math.exp(-0.2 * a * a) * Math.cos(b) + 0.1 * c),
	'5-D': cloud(80, 5, 3, (p) => p.reduce((s, v, k) => s + Math.sin(v * (k + 1) * 0.3), 0)),
	'1-D': cloud(15, 1, 4, ([a]) => Math.tanh(a))
};
const SETUPS: Setup[] = [];
for (const [name, set] of Object.entries(SETS)) {
	SETUPS.push({ name, method: 'rbf-thin-plate', kernel: 'thin_plate_spline', options: {}, set });
	SETUPS.push({ name, method: 'rbf-multiquadric', kernel: 'multiquadric', options: { epsilon: 8 }, set });
	SETUPS.push({ name, method: 'rbf-gaussian', kernel: 'gaussian', options: { epsilon: 3, smoothing: 1e-3 }, set });
	SETUPS.push({ name: `${name} smoothed`, method: 'rbf-thin-plate', kernel: 'thin_plate_spline', options: { smoothing: 0.1 }, set });
}

const scale = (s: ReturnType<typeof cloud>, p: number[]) => p.map((v, k) => (v - Math.min(...s.x.map((q) => q[k]))) / (Math.max(...s.x.map((q) => q[k])) - Math.min(...s.x.map((q) => q[k]))));

let ref: { f: number[]; g: number[][] }[];
beforeAll(() => {
	ref = runScipy(
		`
from scipy.interpolate import RBFInterpolator
out = []
for s in data:
    u = np.array(s['u']); y = np.array(s['y']); P = np.array(s['p'])
    r = RBFInterpolator(u, y, kernel=s['kernel'], epsilon=s['eps'], smoothing=s['smoothing'], degree=1)
    h = 1e-5
    g = []
    for p in P:
        row = []
        for k in range(len(p)):
            e = np.zeros(len(p)); e[k] = h
            row.append(float((r((p + e)[None])[0] - r((p - e)[None])[0]) / (2 * h)))
        g.append(row)
    out.append({'f': r(P), 'g': g})
`,
		SETUPS.map((s) => ({
			u: s.set.x.map((p) => scale(s.set, p)),
			y: s.set.y,
			p: s.set.probes.map((p) => scale(s.set, p)),
			kernel: s.kernel,
			eps: s.options.epsilon ?? 1,
			smoothing: s.options.smoothing ?? 0
		}))
	);
});

describe('RBF fits vs SciPy RBFInterpolator (live)', () => {
	SETUPS.forEach((s, i) => {
		it(`${s.method} ${JSON.stringify(s.options)}, ${s.name}: values 1e-9, gradients vs SciPy differences`, () => {
			const fit = fitScatter(s.method, s.set.x, s.set.y, s.options);
			const spans = s.set.x[0].map((_, k) => Math.max(...s.set.x.map((q) => q[k])) - Math.min(...s.set.x.map((q) => q[k])));
			// 1e-9, unless the system is so ill-conditioned that rounding alone (condition × 2⁻⁵², times 10) allows more
			const tol = Math.max(1e-9, 10 * fit.stats.condition! * 2.2e-16);
			expect(tol, 'condition number too large for a meaningful comparison').toBeLessThan(1e-6);
			s.set.probes.forEach((p, j) => {
				const jet = fit.evaluate(p);
				expectClose(jet.f, ref[i].f[j], tol, `f at probe ${j} (condition ${fit.stats.condition!.toExponential(1)})`);
				// SciPy differentiates in scaled inputs; ∂f/∂x_k = ∂f/∂u_k / span_k
				for (let k = 0; k < p.length; k++) expectClose(jet.grad[k] * spans[k], ref[i].g[j][k], 1e-6, `∂f/∂x${k + 1} at probe ${j}`);
				const g = new Float64Array(p.length);
				expectClose(fit.valueGradient(p, g), jet.f, 1e-13);
				expectClose(fit.value(p), jet.f, 1e-13);
				for (let k = 0; k < p.length; k++) expectClose(g[k], jet.grad[k], 1e-12);
			});
		});
	});
});

interface SolverCase {
	name: string;
	method: ScatterMethod;
	kernel: string;
	options: SurfaceFitOptions;
	solver: 'lu' | 'projected-cholesky';
	set: ReturnType<typeof cloud>;
}
// leave-one-out off: the tail-projected Cholesky is tried where the kernel is conditionally positive definite of the tail's order
const SOLVER_CASES: SolverCase[] = [];
for (const [name, set] of Object.entries(SETS)) {
	SOLVER_CASES.push({ name, method: 'rbf-thin-plate', kernel: 'thin_plate_spline', options: { leaveOneOut: false }, solver: 'projected-cholesky', set });
	SOLVER_CASES.push({ name, method: 'rbf-multiquadric', kernel: 'multiquadric', options: { epsilon: 8, degree: 0, leaveOneOut: false }, solver: 'projected-cholesky', set });
	SOLVER_CASES.push({ name, method: 'rbf-gaussian', kernel: 'gaussian', options: { epsilon: 3, smoothing: 1e-3, degree: -1, leaveOneOut: false }, solver: 'projected-cholesky', set });
	// thin-plate needs a degree-1 tail for the projected block to be positive definite: LU without trying
	SOLVER_CASES.push({ name, method: 'rbf-thin-plate', kernel: 'thin_plate_spline', options: { degree: 0, leaveOneOut: false }, solver: 'lu', set });
}

describe('RBF solvers: projected Cholesky and LU vs SciPy RBFInterpolator (live)', () => {
	let sref: number[][];
	beforeAll(() => {
		sref = runScipy(
			`
from scipy.interpolate import RBFInterpolator
out = []
for s in data:
    r = RBFInterpolator(np.array(s['u']), np.array(s['y']), kernel=s['kernel'], epsilon=s['eps'], smoothing=s['smoothing'], degree=s['degree'])
    out.append(r(np.array(s['p'])))
`,
			SOLVER_CASES.map((s) => ({
				u: s.set.x.map((p) => scale(s.set, p)),
				y: s.set.y,
				p: s.set.probes.map((p) => scale(s.set, p)),
				kernel: s.kernel,
				eps: s.options.epsilon ?? 1,
				smoothing: s.options.smoothing ?? 0,
				degree: s.options.degree ?? 1
			}))
		);
	});
	SOLVER_CASES.forEach((s, i) => {
		it(`${s.method} ${JSON.stringify(s.options)}, ${s.name}: solved by ${s.solver}, values 1e-9 and the same fit as with leave-one-out (LU)`, () => {
			const fit = fitScatter(s.method, s.set.x, s.set.y, s.options);
			expect(fit.solver).toBe(s.solver);
			const withLoo = fitScatter(s.method, s.set.x, s.set.y, { ...s.options, leaveOneOut: true });
			expect(withLoo.solver).toBe('lu');
			const tol = Math.max(1e-9, 10 * withLoo.stats.condition! * 2.2e-16);
			expect(tol, 'condition number too large for a meaningful comparison').toBeLessThan(1e-6);
			// the condition number is Hager's estimate here: a lower bound of the exact one, within 10× (W. W. Hager, 1984)
			expect(fit.stats.condition!).toBeLessThanOrEqual(withLoo.stats.condition! * (1 + 1e-9));
			expect(fit.stats.condition!).toBeGreaterThan(withLoo.stats.condition! / 10);
			s.set.probes.forEach((p, j) => {
				expectClose(fit.value(p), sref[i][j], tol, `f at probe ${j}`);
				expectClose(fit.value(p), withLoo.value(p), tol, `f at probe ${j} vs the LU fit`);
			});
			for (let k = 0; k < fit.tail.length; k++) expectClose(fit.tail[k], withLoo.tail[k], 1e-7, `tail[${k}]`);
		});
	});
	it('falls back to LU when the projected block is not positive definite in rounding (Gaussian, ε = 0.3: condition ~1e18; common practice, no source)', () => {
		const s = SETS['2-D'];
		const fit = fitScatter('rbf-gaussian', s.x, s.y, { epsilon: 0.3, leaveOneOut: false });
		expect(fit.solver).toBe('lu');
		expect(fit.stats.condition!).toBeGreaterThan(1e14);
		expect(fit.notes.some((n) => n.startsWith('ill-conditioned'))).toBe(true);
		// the same kernel with a wider ε is well conditioned and takes the projected path
		expect(fitScatter('rbf-gaussian', s.x, s.y, { epsilon: 3, leaveOneOut: false }).solver).toBe('projected-cholesky');
		// the LU fit still interpolates the data to the accuracy its conditioning allows (interpolation is exact in exact arithmetic)
		let worst = 0;
		s.x.forEach((p, i) => (worst = Math.max(worst, Math.abs(fit.value(p) - s.y[i]))));
		expect(worst).toBeLessThan(1e-2);
	});
});

describe('RBF fits: exactness, Hessians, leave-one-out', () => {
	it('a degree-1 tail reproduces linear functions (every kernel; source: the tail is in the span, common practice)', () => {
		const { x, probes } = cloud(30, 3, 9, () => 0);
		const f = ([a, b, c]: number[]) => 2 - a + 0.5 * b + 3 * c;
		for (const m of ['rbf-thin-plate', 'rbf-multiquadric', 'rbf-gaussian'] as const) {
			const fit = fitScatter(m, x, x.map(f), { epsilon: 2 });
			for (const p of probes) {
				const j = fit.evaluate(p);
				expectClose(j.f, f(p), 1e-8, m);
				expectClose(j.grad[0], -1, 1e-7, m);
				expectClose(j.grad[2], 3, 1e-7, m);
			}
			for (const c of fit.coefficients) expect(Math.abs(c)).toBeLessThan(1e-7);
		}
	});
	it('Hessians match central differences of the exact gradient (common practice, no source)', () => {
		const s = SETS['3-D'];
		for (const m of ['rbf-thin-plate', 'rbf-multiquadric', 'rbf-gaussian'] as const) {
			const fit = fitScatter(m, s.x, s.y, { epsilon: 2 });
			for (const p of s.probes) {
				const jet = fit.evaluate(p);
				for (let k = 0; k < 3; k++) {
					const h = 1e-6 * s.span[k];
					const gp = fit.evaluate(p.map((v, i) => (i === k ? v + h : v))).grad;
					const gm = fit.evaluate(p.map((v, i) => (i === k ? v - h : v))).grad;
					for (let j = 0; j < 3; j++) expectClose(jet.hess[j * 3 + k], (gp[j] - gm[j]) / (2 * h), 1e-5, `${m} H[${j}][${k}]`);
				}
			}
		}
	});
	it("Rippa's closed-form leave-one-out equals brute-force refits (with and without smoothing)", () => {
		const s = SETS['2-D'];
		let checked = 0;
		for (const [m, opts] of [
			['rbf-thin-plate', {}],
			['rbf-gaussian', { epsilon: 3, smoothing: 0.01 }],
			['rbf-multiquadric', { epsilon: 4 }]
		] as const) {
			const fit = fitScatter(m, s.x, s.y, opts);
			for (const i of [0, 7, 19, 33]) {
				const xs = s.x.filter((_, j) => j !== i);
				const ys = s.y.filter((_, j) => j !== i);
				// the refit must scale the inputs as the full fit does: compare only where leaving the point out keeps the box
				const sub = fitScatter(m, xs, ys, opts);
				const sameBox = sub.domain.every((r, k) => r[0] === fit.domain[k][0] && r[1] === fit.domain[k][1]);
				if (!sameBox) continue;
				expectClose(fit.stats.looResiduals![i], s.y[i] - sub.value(s.x[i]), 1e-7, `${m} point ${i}`);
				checked++;
			}
		}
		// points on the box's edge change the scaling when left out and are not compared; most are interior
		expect(checked).toBeGreaterThanOrEqual(9);
	});
	it("without leave-one-out, Hager's estimate (W. W. Hager, 1984) bounds the exact 1-norm condition number from below and is within 10×", () => {
		const s = SETS['3-D'];
		for (const m of ['rbf-thin-plate', 'rbf-gaussian'] as const) {
			const exact = fitScatter(m, s.x, s.y, { epsilon: 3 });
			const est = fitScatter(m, s.x, s.y, { epsilon: 3, leaveOneOut: false });
			expect(est.stats.looResiduals).toBeUndefined();
			expect(est.stats.condition!).toBeLessThanOrEqual(exact.stats.condition! * (1 + 1e-9));
			expect(est.stats.condition!).toBeGreaterThan(exact.stats.condition! / 10);
			for (const p of s.probes) expectClose(est.value(p), exact.value(p), 1e-9);
		}
	});
	it('warns with a condition estimate when the system is ill-conditioned', () => {
		const s = SETS['2-D'];
		const fit = fitScatter('rbf-gaussian', s.x, s.y, { epsilon: 0.05 });
		expect(fit.stats.condition).toBeGreaterThan(1e8);
		expect(fit.notes.some((n) => /ill-conditioned: condition number ≈ \d/.test(n))).toBe(true);
		const ok = fitScatter('rbf-thin-plate', s.x, s.y);
		expect(ok.notes.some((n) => n.startsWith('ill-conditioned'))).toBe(false);
	});

	// a 21 × 21 table of Rosenbrock's function (values 0 to ~3,600): with ε = 1 in unit-range inputs the
	// Gaussian and multiquadric systems have condition numbers near 1e20 and the solve loses the data
	const grid: number[][] = [];
	for (let i = 0; i <= 20; i++) for (let j = 0; j <= 20; j++) grid.push([-2 + 0.2 * i, -1 + 0.2 * j]);
	const rosen = grid.map(([x, y]) => 100 * (y - x * x) ** 2 + (1 - x) ** 2);

	it('an interpolant that does not give its data back says so, naming the row and the size (ε = 1 on a 21 × 21 table)', () => {
		for (const m of ['rbf-gaussian', 'rbf-multiquadric'] as ScatterMethod[]) {
			const bad = fitScatter(m, grid, rosen, { epsilon: 1 });
			// the residual measured here, independently of the fit's own figure
			const worst = Math.max(...grid.map((p, i) => Math.abs(bad.value(p) - rosen[i])));
			expect(worst).toBeGreaterThan(1e-6 * 3609);
			expect(bad.stats.dataResidual).toBe(worst);
			const note = bad.notes.find((n) => n.startsWith('does not reproduce its data'));
			expect(note, `${m}: ${bad.notes.join(' | ')}`).toMatch(/off by [\d.e+]+ at row \d+ \([\d.e+]+ % of the values' range\).*larger epsilon/);
		}
		const good = fitScatter('rbf-thin-plate', grid, rosen);
		expect(good.stats.dataResidual).toBeLessThanOrEqual(1e-6 * 3609);
		expect(good.notes.some((n) => n.startsWith('does not reproduce'))).toBe(false);
		// smoothing > 0 is not an interpolant: no such check, no such note
		const smooth = fitScatter('rbf-gaussian', grid, rosen, { epsilon: 1, smoothing: 1 });
		expect(smooth.stats.dataResidual).toBeUndefined();
		expect(smooth.notes.some((n) => n.startsWith('does not reproduce'))).toBe(false);
	});

	it("the default ε of multiquadric and Gaussian follows Hardy's rule (R. L. Hardy 1971: c = 0.815 × mean nearest-neighbour distance; ε = 1/c here) and gives the data back", () => {
		// the mean nearest-neighbour distance of the unit-range grid, by hand: every point's nearest neighbour is 1/20 away
		const expected = 1 / (0.815 * 0.05);
		for (const m of ['rbf-gaussian', 'rbf-multiquadric'] as ScatterMethod[]) {
			const fit = fitScatter(m, grid, rosen);
			expect(fit.options.epsilon).toBeCloseTo(expected, 10);
			expect(fit.notes.some((n) => n.startsWith(`epsilon = ${Number(expected.toPrecision(3))} in unit-range inputs`))).toBe(true);
			expect(fit.stats.dataResidual).toBeLessThanOrEqual(1e-6 * 3609);
			expect(fit.stats.condition).toBeLessThan(1e8);
			// the same fit as with that ε given explicitly (so the SciPy comparisons above, which give ε, cover it)
			const explicit = fitScatter(m, grid, rosen, { epsilon: fit.options.epsilon });
			expect(explicit.value([0.33, 1.71])).toBe(fit.value([0.33, 1.71]));
		}
		// thin-plate keeps ε = 1 (the kernel is scale-free up to a multiple of r²)
		expect(fitScatter('rbf-thin-plate', grid, rosen).options.epsilon).toBe(1);
	});
});

describe('RBF fits: bad input', () => {
	function msg(fn: () => unknown): string {
		try {
			fn();
		} catch (e) {
			expect(e).toBeInstanceOf(FitError);
			return `${(e as FitError).code}: ${(e as FitError).message}`;
		}
		return 'no error';
	}
	const x = [
		[0, 0],
		[1, 0],
		[0, 1],
		[1, 1],
		[0.5, 0.2]
	];
	it('coincident points are refused, naming both rows', () => {
		expect(msg(() => fitScatter('rbf-thin-plate', [...x, [1, 0]], [1, 2, 3, 4, 5, 6]))).toMatch(/^coincident-points: rbf-thin-plate: rows 2 and 6 have the same inputs/);
	});
	it('distinct points that meet once scaled to unit range are refused as coincident, saying why (common practice, no source)', () => {
		// (0.3 + 1e6) and (0.30000000000000004 + 1e6) round to the same double, so the scaled points are equal
		const far = [[-1e6, 0], [0.3, 0.5], [0.30000000000000004, 0.5], [1, 1], [0.5, 0.2]];
		expect(msg(() => fitScatter('rbf-thin-plate', far, [1, 2, 3, 4, 5]))).toMatch(/^coincident-points: rbf-thin-plate: rows 2 and 3 differ by less than the rounding of the inputs scaled to unit range/);
	});
	it('too many inputs, too few points, mismatched lengths, bad options, constant input', () => {
		expect(msg(() => fitScatter('rbf-gaussian', [[1, 2, 3, 4, 5, 6, 7]], [1]))).toMatch(/^too-many-inputs: .*at most 6 inputs, got 7/);
		expect(msg(() => fitScatter('rbf-gaussian', x.slice(0, 3), [1, 2, 3]))).toMatch(/^too-few-points: rbf-gaussian: 3 points; at least 4/);
		expect(msg(() => fitScatter('rbf-gaussian', x, [1, 2]))).toMatch(/^length-mismatch/);
		expect(msg(() => fitScatter('rbf-gaussian', x, [1, 2, 3, 4, 5], { smoothing: -1 }))).toMatch(/^bad-option: .*smoothing/);
		expect(msg(() => fitScatter('rbf-gaussian', x, [1, 2, 3, 4, 5], { epsilon: 0 }))).toMatch(/^bad-option: .*epsilon/);
		expect(msg(() => fitScatter('rbf-gaussian', x.map((p) => [p[0], 3]), [1, 2, 3, 4, 5]))).toMatch(/^singular: .*input 2 has the same value in every row/);
		expect(msg(() => fitScatter('rbf-gaussian', [...x.slice(0, 4), [NaN, 1]], [1, 2, 3, 4, 5]))).toMatch(/^non-finite: .*rows 5/);
	});
});
