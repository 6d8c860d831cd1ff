/**
 * Grid fits against SciPy 1.10 (Debian, /usr/bin/python3) called live, on
 * unevenly spaced axes in 2, 3 and 4 inputs:
 * - grid-linear: RegularGridInterpolator(method='linear') values; its
 *   gradient by the multilinear formula ∂f/∂x_k = (f(…, a_{i+1}, …) − f(…, a_i, …))/h_i
 *   on SciPy's own values (exact for a function linear along x_k in the cell);
 * - grid-cubic-natural / grid-cubic-not-a-knot: CubicSpline(bc_type) applied
 *   along each input in turn, values, gradients and Hessians (derivative
 *   orders nu per input) — the tensor-product spline;
 * - grid-akima / grid-pchip: node slopes from SciPy's Akima1DInterpolator and
 *   PchipInterpolator applied axis by axis (line by line, inputs in
 *   increasing order, mixed slopes as slopes of slopes), the cells assembled by
 *   SciPy's CubicHermiteSpline along each input in turn. On the grid lines of
 *   a 2-input grid this is also SciPy's nested Akima1DInterpolator /
 *   PchipInterpolator evaluation (checked); inside a cell the nested
 *   evaluation rebuilds the slopes from interpolated values, which is not a
 *   fixed polynomial per cell (no exact Hessian), so we do not use it there.
 * Tolerance 1e-9 relative (expectClose).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { runScipy } from '../../reference/scipy';
import { expectClose } from '../../reference/tolerance';
import { FitError, TensorGrid, fitGrid, gridMethods } from '../../../src/lib/numerics/fits';
import type { GridMethod } from '../../../src/lib/numerics/fits';
import { randomPoints, tabulate, unevenAxis } from './helpers';

const METHODS = Object.keys(gridMethods) as GridMethod[];

interface Case {
	name: string;
	axes: number[][];
	values: number[];
	points: number[][];
	linePoints: number[][];
}

function makeCase(name: string, axes: number[][], f: (x: number[]) => number, seed: number): Case {
	const points = randomPoints(axes, 12, seed);
	// points on grid lines: one coordinate on an interior grid value, the others random
	const linePoints = randomPoints(axes, 6, seed + 1).map((p, j) => {
		const k = j % axes.length;
		const a = axes[k];
		const q = p.slice();
		q[k] = a[1 + (j % (a.length - 2))];
		return q;
	});
	return { name, axes, values: tabulate(axes, f), points, linePoints };
}

const CASES: Case[] = [
	makeCase('2-D smooth', [unevenAxis(9, 0, 3, 1), unevenAxis(7, -1, 2, 2)], ([x, y]) => Math.sin(x) * Math.cos(1.3 * y) + 0.2 * x * y * y, 10),
	makeCase('2-D rough', [unevenAxis(8, 0, 10, 3), unevenAxis(10, 0, 5, 4)], ([x, y]) => Math.abs(Math.sin(x * y / 3)) + (x > 5 ? 1 : 0) + 0.1 * y, 20),
	makeCase('3-D', [unevenAxis(6, 0, 2, 5), unevenAxis(5, 1, 3, 6), unevenAxis(7, -2, 0, 7)], ([x, y, z]) => Math.exp(0.3 * x) * Math.sin(y + z) + x * z, 30),
	makeCase('4-D', [unevenAxis(5, 0, 1, 8), unevenAxis(4, 0, 2, 9), unevenAxis(5, -1, 1, 10), unevenAxis(4, 2, 3, 11)], ([a, b, c, e]) => Math.cos(a + 0.5 * b) * (1 + c * c) + a * e - b * c * e, 40)
];

interface MethodRef {
	f: number[];
	g: number[][];
	h?: number[][][];
	lineF?: number[];
}
type Ref = Record<string, Record<GridMethod, MethodRef>>;

const PY = `
from scipy.interpolate import RegularGridInterpolator, CubicSpline, Akima1DInterpolator, PchipInterpolator, CubicHermiteSpline
out = {}
for case in data:
    axes = [np.array(a, dtype=float) for a in case['axes']]
    d = len(axes)
    V = np.array(case['values'], dtype=float).reshape([len(a) for a in axes])
    P = [np.array(p, dtype=float) for p in case['points']]
    L = [np.array(p, dtype=float) for p in case['linePoints']]
    unit = [tuple(1 if j == k else 0 for j in range(d)) for k in range(d)]
    res = {}
    rgi = RegularGridInterpolator(axes, V, method='linear')
    def lin_grad(p):
        g = []
        for k in range(d):
            a = axes[k]
            i = min(max(int(np.searchsorted(a, p[k], side='right')) - 1, 0), len(a) - 2)
            lo = p.copy(); hi = p.copy(); lo[k] = a[i]; hi[k] = a[i + 1]
            g.append(float((rgi(hi[None])[0] - rgi(lo[None])[0]) / (a[i + 1] - a[i])))
        return g
    res['grid-linear'] = {'f': [float(rgi(p[None])[0]) for p in P], 'g': [lin_grad(p) for p in P]}
    for bc, name in (('natural', 'grid-cubic-natural'), ('not-a-knot', 'grid-cubic-not-a-knot')):
        def ev(p, nu):
            arr = V
            for k in range(d):
                arr = CubicSpline(axes[k], arr, axis=0, bc_type=bc)(p[k], nu[k])
            return float(arr)
        zero = tuple(0 for _ in range(d))
        res[name] = {
            'f': [ev(p, zero) for p in P],
            'g': [[ev(p, unit[k]) for k in range(d)] for p in P],
            'h': [[[ev(p, tuple(unit[j][i] + unit[k][i] for i in range(d))) for k in range(d)] for j in range(d)] for p in P],
        }
    for kind, name, cls in (('akima', 'grid-akima', Akima1DInterpolator), ('pchip', 'grid-pchip', PchipInterpolator)):
        def slopes(a, arr, axis):
            return np.apply_along_axis(lambda y: cls(a, y).derivative()(a), axis, arr)
        D = {0: V}
        for S in range(1, 2 ** d):
            k = S.bit_length() - 1
            D[S] = slopes(axes[k], D[S ^ (1 << k)], k)
        def ev(p, nu):
            cur = D
            for k in range(d):
                new = {}
                for S, arr in cur.items():
                    if S & (1 << k):
                        continue
                    new[S] = CubicHermiteSpline(axes[k], arr, cur[S | (1 << k)], axis=0)(p[k], nu[k])
                cur = new
            return float(cur[0])
        zero = tuple(0 for _ in range(d))
        r = {'f': [ev(p, zero) for p in P], 'g': [[ev(p, unit[k]) for k in range(d)] for p in P]}
        if d == 2:
            def nested(p):
                v = cls(axes[0], V, axis=0)(p[0])
                return float(cls(axes[1], v)(p[1]))
            r['lineF'] = [nested(p) for p in L]
        res[name] = r
    out[case['name']] = res
`;

let ref: Ref;
beforeAll(() => {
	ref = runScipy<Ref>(PY, CASES);
});

describe('grid fits vs SciPy 1.10 (live)', () => {
	for (const c of CASES) {
		for (const method of METHODS) {
			it(`${method}, ${c.name}: values and gradients to 1e-9`, () => {
				const fit = fitGrid(method, c.axes, c.values);
				const r = ref[c.name][method];
				c.points.forEach((p, i) => {
					const jet = fit.evaluate(p);
					expectClose(jet.f, r.f[i], 1e-9, `f at point ${i}`);
					for (let k = 0; k < p.length; k++) expectClose(jet.grad[k], r.g[i][k], 1e-9, `∂f/∂x${k + 1} at point ${i}`);
					const g = new Float64Array(p.length);
					// the three paths sum the same terms in a different order: equal to rounding
					expectClose(fit.valueGradient(p, g), jet.f, 1e-14, 'valueGradient f');
					for (let k = 0; k < p.length; k++) expectClose(g[k], jet.grad[k], 1e-13, 'valueGradient grad');
					expectClose(fit.value(p), jet.f, 1e-14, 'value');
				});
			});
		}
		for (const method of ['grid-cubic-natural', 'grid-cubic-not-a-knot'] as const) {
			it(`${method}, ${c.name}: full Hessian (mixed partials) to 1e-9`, () => {
				const fit = fitGrid(method, c.axes, c.values);
				expect(fit.hessian).toBe('exact');
				const h = ref[c.name][method].h!;
				const d = c.axes.length;
				c.points.forEach((p, i) => {
					const jet = fit.evaluate(p);
					for (let j = 0; j < d; j++) for (let k = 0; k < d; k++) expectClose(jet.hess[j * d + k], h[i][j][k], 1e-9, `∂²f/∂x${j + 1}∂x${k + 1} at point ${i}`);
				});
			});
		}
		if (c.axes.length === 2) {
			for (const method of ['grid-akima', 'grid-pchip'] as const) {
				it(`${method}, ${c.name}: on grid lines equals SciPy's nested axis-by-axis evaluation`, () => {
					const fit = fitGrid(method, c.axes, c.values);
					c.linePoints.forEach((p, i) => expectClose(fit.value(p), ref[c.name][method].lineF![i], 1e-9, `line point ${i}`));
				});
			}
		}
	}
});

describe('grid fits: exactness (common practice, no source: an interpolant reproduces its own function class)', () => {
	const ax = [unevenAxis(6, -1, 2, 51), unevenAxis(5, 0, 3, 52)];
	const pts = randomPoints(ax, 20, 53);
	it('grid-linear reproduces a bilinear function: value and gradient', () => {
		const f = ([x, y]: number[]) => 1 + 2 * x - 3 * y + 0.5 * x * y;
		const fit = fitGrid('grid-linear', ax, tabulate(ax, f));
		for (const [x, y] of pts) {
			const j = fit.evaluate([x, y]);
			expectClose(j.f, f([x, y]), 1e-12);
			expectClose(j.grad[0], 2 + 0.5 * y, 1e-12);
			expectClose(j.grad[1], -3 + 0.5 * x, 1e-12);
			// inside a cell the Hessian is the bilinear one: zero on the diagonal, 0.5 off it
			expectClose(j.hess[0], 0, 1e-12);
			expectClose(j.hess[1], 0.5, 1e-12);
			expectClose(j.hess[3], 0, 1e-12);
		}
	});
	it('grid-linear reproduces a trilinear function', () => {
		const ax3 = [...ax, unevenAxis(4, 5, 6, 54)];
		const f = ([x, y, z]: number[]) => 0.3 - x + 2 * y * z - x * y * z;
		const fit = fitGrid('grid-linear', ax3, tabulate(ax3, f));
		for (const p of randomPoints(ax3, 20, 55)) {
			const j = fit.evaluate(p);
			expectClose(j.f, f(p), 1e-12);
			expectClose(j.grad[2], 2 * p[1] - p[0] * p[1], 1e-12);
		}
	});
	it('grid-cubic-not-a-knot reproduces cubic × cubic (and cubic³ in 3-D): value, gradient, Hessian', () => {
		const p = (x: number) => 1 - 2 * x + 0.5 * x * x * x;
		const dp = (x: number) => -2 + 1.5 * x * x;
		const d2p = (x: number) => 3 * x;
		const q = (y: number) => 2 + y - y * y + 0.25 * y * y * y;
		const dq = (y: number) => 1 - 2 * y + 0.75 * y * y;
		const d2q = (y: number) => -2 + 1.5 * y;
		const fit = fitGrid('grid-cubic-not-a-knot', ax, tabulate(ax, ([x, y]) => p(x) * q(y)));
		for (const [x, y] of pts) {
			const j = fit.evaluate([x, y]);
			expectClose(j.f, p(x) * q(y), 1e-11);
			expectClose(j.grad[0], dp(x) * q(y), 1e-11);
			expectClose(j.grad[1], p(x) * dq(y), 1e-11);
			expectClose(j.hess[0], d2p(x) * q(y), 1e-10);
			expectClose(j.hess[1], dp(x) * dq(y), 1e-10);
			expectClose(j.hess[2], dp(x) * dq(y), 1e-10);
			expectClose(j.hess[3], p(x) * d2q(y), 1e-10);
		}
		const ax3 = [...ax, unevenAxis(5, -1, 1, 56)];
		const fit3 = fitGrid('grid-cubic-not-a-knot', ax3, tabulate(ax3, ([x, y, z]) => p(x) * q(y) * p(z)));
		for (const pt of randomPoints(ax3, 10, 57)) {
			const j = fit3.evaluate(pt);
			expectClose(j.f, p(pt[0]) * q(pt[1]) * p(pt[2]), 1e-10);
			expectClose(j.hess[2], dp(pt[0]) * q(pt[1]) * dp(pt[2]), 1e-9);
		}
	});
	it('every cubic grid method reproduces a bilinear function (their slopes are exact for lines)', () => {
		const f = ([x, y]: number[]) => 1 + 2 * x - 3 * y + 0.5 * x * y;
		for (const m of ['grid-cubic-natural', 'grid-cubic-not-a-knot', 'grid-akima', 'grid-pchip'] as const) {
			const fit = fitGrid(m, ax, tabulate(ax, f));
			for (const pt of pts) expectClose(fit.value(pt), f(pt), 1e-11, m);
		}
	});
	it('every method interpolates the data at the nodes', () => {
		const c = CASES[2];
		for (const m of METHODS) {
			const fit = fitGrid(m, c.axes, c.values);
			let n = 0;
			for (let i = 0; i < c.axes[0].length; i++)
				for (let j = 0; j < c.axes[1].length; j++)
					for (let k = 0; k < c.axes[2].length; k++) expectClose(fit.value([c.axes[0][i], c.axes[1][j], c.axes[2][k]]), c.values[n++], 1e-12, m);
		}
	});
});

describe('grid fits: Hessians vs central differences of the exact gradient (common practice, no source)', () => {
	for (const c of CASES) {
		for (const method of METHODS) {
			it(`${method}, ${c.name}`, () => {
				const fit = fitGrid(method, c.axes, c.values);
				const d = c.axes.length;
				for (const p of c.points) {
					const jet = fit.evaluate(p);
					for (let k = 0; k < d; k++) {
						// step small enough to stay inside the point's cell on both sides
						const a = c.axes[k];
						const span = a[a.length - 1] - a[0];
						const hstep = 1e-7 * span;
						const gp = fit.evaluate(p.map((v, i) => (i === k ? v + hstep : v))).grad;
						const gm = fit.evaluate(p.map((v, i) => (i === k ? v - hstep : v))).grad;
						for (let j = 0; j < d; j++) {
							const cd = (gp[j] - gm[j]) / (2 * hstep);
							const scale = Math.max(1, ...Array.from(jet.hess).map(Math.abs));
							expect(Math.abs(jet.hess[j * d + k] - cd), `H[${j}][${k}]`).toBeLessThan(1e-5 * scale);
						}
					}
					for (let j = 0; j < d; j++) for (let k = 0; k < d; k++) expect(jet.hess[j * d + k]).toBe(jet.hess[k * d + j]);
				}
			});
		}
	}
});

describe('grid fits: classes, lines, extrapolation, fit file', () => {
	const c = CASES[0];
	it('declares C0/C1/C2 and the Hessian kind; reports the grid line a point lies on', () => {
		expect(fitGrid('grid-linear', c.axes, c.values).continuity).toBe('C0');
		expect(fitGrid('grid-akima', c.axes, c.values).hessian).toBe('piecewise');
		expect(fitGrid('grid-pchip', c.axes, c.values).axisContinuity).toEqual(['C1', 'C1']);
		const fit = fitGrid('grid-linear', c.axes, c.values);
		const j = fit.evaluate([c.axes[0][3], 0.5 * (c.axes[1][2] + c.axes[1][3])]);
		expect(Array.from(j.onLine)).toEqual([3, -1]);
		// the gradient of grid-linear jumps across that line: one-sided slopes differ
		const eps = 1e-6;
		const left = fit.evaluate([c.axes[0][3] - eps, j.grad[1]]).grad[0];
		const right = fit.evaluate([c.axes[0][3] + eps, j.grad[1]]).grad[0];
		expect(Math.abs(left - right)).toBeGreaterThan(1e-3);
	});
	it('C1 fits: the gradient is continuous across grid lines; C2 fits: the Hessian too', () => {
		const x0 = c.axes[0][4];
		const y = 0.3;
		for (const m of ['grid-akima', 'grid-pchip', 'grid-cubic-natural'] as const) {
			const fit = fitGrid(m, c.axes, c.values);
			const l = fit.evaluate([x0 - 1e-9, y]);
			const r = fit.evaluate([x0 + 1e-9, y]);
			expect(Math.abs(l.grad[0] - r.grad[0])).toBeLessThan(1e-6);
			if (m === 'grid-cubic-natural') expect(Math.abs(l.hess[0] - r.hess[0])).toBeLessThan(1e-6);
		}
	});
	it("refuses points outside by default; 'extend' continues the edge cell", () => {
		const fit = fitGrid('grid-pchip', c.axes, c.values);
		expect(() => fit.evaluate([-0.1, 0])).toThrowError(/input 1 = -0.1 lies outside/);
		const ext = fitGrid('grid-pchip', c.axes, c.values, { extrapolation: 'extend' });
		const j = ext.evaluate([-0.1, 0]);
		expect(j.outside).toBe(true);
		expect(Number.isFinite(j.f)).toBe(true);
	});
	it('a decreasing axis is reversed with its values (same surface)', () => {
		const up = fitGrid('grid-cubic-not-a-knot', c.axes, c.values);
		const nx = c.axes[0].length;
		const ny = c.axes[1].length;
		const flipped: number[] = [];
		for (let i = nx - 1; i >= 0; i--) for (let j = 0; j < ny; j++) flipped.push(c.values[i * ny + j]);
		const down = fitGrid('grid-cubic-not-a-knot', [c.axes[0].slice().reverse(), c.axes[1]], flipped);
		expect(down.notes).toContain('input 1 was decreasing; reversed');
		for (const p of c.points) expectClose(down.value(p), up.value(p), 1e-13);
	});
	it('fit file round trip is bit-exact', () => {
		for (const m of METHODS) {
			const fit = fitGrid(m, c.axes, c.values);
			const back = TensorGrid.fromJSON(JSON.parse(JSON.stringify(fit.toJSON())));
			for (const p of c.points) expect(back.value(p)).toBe(fit.value(p));
		}
	});
});

describe('grid fits: bad input gets a typed error naming the input and the limit', () => {
	const ax = [
		[0, 1, 2],
		[0, 1, 2, 3]
	];
	const vals = tabulate(ax, ([x, y]) => x + y);
	function code(fn: () => unknown): string {
		try {
			fn();
		} catch (e) {
			expect(e).toBeInstanceOf(FitError);
			return `${(e as FitError).code}: ${(e as FitError).message}`;
		}
		return 'no error';
	}
	it('non-monotone axis', () => {
		expect(code(() => fitGrid('grid-linear', [[0, 2, 1], ax[1]], vals))).toMatch(/^non-monotone-axis: grid-linear: input 1 is not strictly increasing: position 3 \(1\) after position 2 \(2\)/);
		expect(code(() => fitGrid('grid-pchip', [ax[0], [0, 1, 1, 3]], vals))).toMatch(/^non-monotone-axis: .*input 2/);
	});
	it('too few points per axis for the method', () => {
		expect(code(() => fitGrid('grid-akima', [[0, 1], ax[1]], tabulate([[0, 1], ax[1]], () => 1)))).toMatch(/^too-few-points: grid-akima: input 1 has 2 grid values; the method needs at least 3/);
		expect(code(() => fitGrid('grid-linear', [[0], ax[1]], [1, 2, 3, 4]))).toMatch(/^too-few-points: .*input 1 has 1 grid value;/);
	});
	it('too many inputs, too few inputs', () => {
		const a5 = [ax[0], ax[0], ax[0], ax[0], ax[0]];
		expect(code(() => fitGrid('grid-cubic-natural', a5, new Array(243).fill(0)))).toMatch(/^too-many-inputs: grid-cubic-natural: at most 4 inputs on a grid, got 5/);
		expect(code(() => fitGrid('grid-linear', [ax[0]], [1, 2, 3]))).toMatch(/^too-few-points: .*at least 2 inputs/);
	});
	it('value count, non-finite values and non-finite points', () => {
		expect(code(() => fitGrid('grid-linear', ax, vals.slice(1)))).toMatch(/^shape-mismatch: grid-linear: a 3 × 4 grid has 12 nodes, but 11 values/);
		const bad = vals.slice();
		bad[5] = NaN;
		expect(code(() => fitGrid('grid-linear', ax, bad))).toMatch(/^non-finite: .*grid nodes 6 /);
		const fit = fitGrid('grid-linear', ax, vals);
		expect(code(() => fit.evaluate([NaN, 1]))).toMatch(/^invalid-point/);
		expect(code(() => fit.evaluate([1]))).toMatch(/^shape-mismatch/);
		expect(code(() => fitGrid('grid-linear', ax, vals, { extrapolation: 'hold' as never }))).toMatch(/^bad-option/);
	});
	it('the 2-D fast paths (value, valueGradient) refuse what the general path refuses', () => {
		for (const m of ['grid-linear', 'grid-pchip'] as const) {
			const fit = fitGrid(m, ax, vals);
			const g = new Float64Array(2);
			expect(code(() => fit.valueGradient([NaN, 1], g))).toMatch(/^invalid-point: .*input 1 is NaN/);
			expect(code(() => fit.value([0.5, Infinity]))).toMatch(/^invalid-point: .*input 2 is Infinity/);
			expect(code(() => fit.value([1]))).toMatch(/^shape-mismatch: .*2 inputs, got 1/);
			expect(code(() => fit.valueGradient([ax[0][0] - 1, ax[1][0]], g))).toMatch(/^outside-domain: .*input 1 = /);
			const ext = fitGrid(m, ax, vals, { extrapolation: 'extend' });
			const far = [ax[0][2] + 5, ax[1][0] - 3];
			expect(ext.valueGradient(far, g)).toBeCloseTo(ext.evaluate(far).f, 12);
		}
	});
	it('cell lookup on a very uneven axis: every node, every midpoint and random points match a linear scan (bilinear by hand)', () => {
		// clustered knots, a huge gap, a near-duplicate pair: the bucket table's worst shapes (common practice, no source)
		const a0 = [...Array.from({ length: 40 }, (_, i) => i * 1e-6), 1, 1e3, 1e3 + 1e-9, 2e3];
		const a1 = [-5, -4.999, 0, 7, 7.0000001, 100];
		const f = ([x, y]: number[]) => Math.sin(7 * x) + Math.cos(y) + x * y * 1e-3;
		const fit = fitGrid('grid-linear', [a0, a1], tabulate([a0, a1], f));
		const cell = (a: number[], v: number) => {
			let i = 0;
			while (i < a.length - 2 && a[i + 1] <= v) i++;
			return i;
		};
		const byHand = (p: number[]) => {
			const i = cell(a0, p[0]);
			const j = cell(a1, p[1]);
			const t = (p[0] - a0[i]) / (a0[i + 1] - a0[i]);
			const s = (p[1] - a1[j]) / (a1[j + 1] - a1[j]);
			const v = (ii: number, jj: number) => f([a0[ii], a1[jj]]);
			return (1 - t) * ((1 - s) * v(i, j) + s * v(i, j + 1)) + t * ((1 - s) * v(i + 1, j) + s * v(i + 1, j + 1));
		};
		const pts: number[][] = [];
		a0.forEach((x, i) => a1.forEach((y, j) => {
			pts.push([x, y]);
			if (i + 1 < a0.length && j + 1 < a1.length) pts.push([(x + a0[i + 1]) / 2, (y + a1[j + 1]) / 2]);
		}));
		let seed = 3;
		const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
		for (let q = 0; q < 2000; q++) pts.push([2e3 * rnd() ** 4, -5 + 105 * rnd()]);
		const g = new Float64Array(2);
		for (const p of pts) {
			const want = byHand(p);
			expectClose(fit.value(p), want, 1e-12, `value at ${p}`);
			expectClose(fit.valueGradient(p, g), want, 1e-12, `valueGradient at ${p}`);
			expectClose(fit.evaluate(p).f, want, 1e-12, `evaluate at ${p}`);
		}
	});
	it('Float64Array values: non-finite nodes named; grid-linear keeps the array (no copy), reversed axes copy', () => {
		const bad = Float64Array.from(vals);
		bad[3] = Infinity;
		bad[7] = NaN;
		expect(code(() => fitGrid('grid-linear', ax, bad))).toMatch(/^non-finite: .*grid nodes 4, 8 /);
		expect(code(() => fitGrid('grid-akima', ax, bad))).toMatch(/^non-finite: .*grid nodes 4, 8 /);
		const v = Float64Array.from(vals);
		expect(fitGrid('grid-linear', ax, v).data).toBe(v);
		const down = [ax[0].slice().reverse(), ax[1]];
		expect(fitGrid('grid-linear', down, v).data).not.toBe(v);
	});
});
