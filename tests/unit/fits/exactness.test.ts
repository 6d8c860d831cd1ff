/**
 * Exactness properties that hold by construction: reproduction of
 * polynomials, interpolation, declared = measured continuity, bit-exact fit
 * files, and agreement of the batch and single-point paths.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { expectClose } from '../../reference/tolerance';
import { auditSmoothness } from '../../../src/lib/numerics/audit/smoothness';
import { curveMethods, fitCurve, fitFromJSON, PiecewisePolynomial } from '../../../src/lib/numerics/fits';
import type { CurveFitOptions, CurveMethod } from '../../../src/lib/numerics/fits';
import { unevenRough, unevenSmooth } from './fixtures';
import { extremes, maxError, sameBits } from './helpers';

const METHODS = Object.keys(curveMethods) as CurveMethod[];

/** Options that make each method well defined on data with slopes near `s0`, `s1` at the ends. */
function optionsFor(method: CurveMethod, s0 = 0.5, s1 = -0.25): CurveFitOptions {
	switch (method) {
		case 'cubic-clamped':
			return { slopes: [s0, s1] };
		case 'polynomial-least-squares':
			return { degree: 3 };
		case 'smoothing-spline':
			return { lambda: 0.05 };
		case 'softened-linear':
			return { width: 0.3 };
		default:
			return {};
	}
}

describe('every method reproduces a straight line (uneven knots)', () => {
	const x = [-2, -1.7, -0.2, 0.1, 1.9, 2.05, 4, 6.5];
	const line = (v: number) => 1.25 - 0.8 * v;
	it.each(METHODS)('%s', (method) => {
		const opts = method === 'cubic-clamped' ? { slopes: [-0.8, -0.8] as [number, number] } : optionsFor(method);
		const fit = fitCurve(method, x, x.map(line), opts);
		expect(maxError(fit, line, 2001)).toBeLessThan(5e-13);
		for (const v of [-2, 0.05, 3.3, 6.5]) {
			const j = fit.evaluate(v);
			expectClose(j.df, -0.8, 1e-12, `${method} f′`);
			expect(Math.abs(j.d2f)).toBeLessThan(1e-11);
		}
	});
	it('smoothing-spline with λ chosen by GCV too', () => {
		const fit = fitCurve('smoothing-spline', x, x.map(line));
		expect(maxError(fit, line, 2001)).toBeLessThan(1e-13);
	});
});

describe('polynomial reproduction', () => {
	const coeff = fc.array(fc.double({ min: -5, max: 5, noNaN: true }), { minLength: 4, maxLength: 4 });
	// Knots from a start and positive gaps (spacing ratios up to 100).
	const knots = fc
		.tuple(fc.double({ min: -3, max: 0, noNaN: true }), fc.array(fc.double({ min: 0.02, max: 2, noNaN: true }), { minLength: 4, maxLength: 11 }))
		.map(([a, gaps]) => gaps.reduce((xs, g) => [...xs, xs[xs.length - 1] + g], [a]));

	it('not-a-knot reproduces any cubic', () => {
		fc.assert(
			fc.property(coeff, knots, (c, x) => {
				const p = (v: number) => c[0] + v * (c[1] + v * (c[2] + v * c[3]));
				const fit = fitCurve('cubic-not-a-knot', x, x.map(p));
				const scale = 1 + Math.abs(c[0]) + 3 * Math.abs(c[1]) + 9 * Math.abs(c[2]) + 27 * Math.abs(c[3]);
				// conditioning of the spline system grows with the spacing ratio; 1e-9 of the scale is ample
				return maxError(fit, p, 301) <= 1e-9 * scale;
			}),
			{ numRuns: 200, seed: 20240501 }
		);
	});

	it('clamped with exact end slopes reproduces any cubic', () => {
		fc.assert(
			fc.property(coeff, knots, (c, x) => {
				const p = (v: number) => c[0] + v * (c[1] + v * (c[2] + v * c[3]));
				const dp = (v: number) => c[1] + v * (2 * c[2] + 3 * c[3] * v);
				const fit = fitCurve('cubic-clamped', x, x.map(p), { slopes: [dp(x[0]), dp(x[x.length - 1])] });
				const scale = 1 + Math.abs(c[0]) + 3 * Math.abs(c[1]) + 9 * Math.abs(c[2]) + 27 * Math.abs(c[3]);
				return maxError(fit, p, 301) <= 1e-9 * scale;
			}),
			{ numRuns: 200, seed: 7 }
		);
	});

	it.each([0, 1, 2, 3, 4, 5, 6])('least squares of degree d reproduces polynomials of degree ≤ d (d = %i)', (d) => {
		const x = unevenSmooth(25, 3 + d).x.map((v) => 300 + 10 * v); // far from 0: tests the centring and scaling
		for (let k = 0; k <= d; k++) {
			const p = (v: number) => {
				const t = (v - 400) / 100;
				let s = 0;
				for (let q = 0; q <= k; q++) s += ((q % 2 ? -1 : 1) * (q + 1) * t ** q) / 2;
				return s;
			};
			const fit = fitCurve('polynomial-least-squares', x, x.map(p), { degree: d });
			expect(maxError(fit, p, 501)).toBeLessThan(1e-11);
			expect(fit.stats.rss!).toBeLessThan(1e-20);
		}
	});

	it('the global polynomial reproduces a degree-(n−1) polynomial with exact f′ and f″', () => {
		const x = [-1, -0.6, -0.1, 0.3, 0.35, 0.9, 1.4];
		const p = (v: number) => 1 - 2 * v + 0.5 * v ** 3 - v ** 5 + 0.25 * v ** 6;
		const dp = (v: number) => -2 + 1.5 * v ** 2 - 5 * v ** 4 + 1.5 * v ** 5;
		const d2p = (v: number) => 3 * v - 20 * v ** 3 + 7.5 * v ** 4;
		const fit = fitCurve('polynomial-global', x, x.map(p));
		for (let i = 0; i <= 400; i++) {
			const v = -1 + (2.4 * i) / 400;
			const j = fit.evaluate(v);
			expectClose(j.f, p(v), 1e-12, 'p');
			expectClose(j.df, dp(v), 1e-11, 'p′');
			expectClose(j.d2f, d2p(v), 1e-10, 'p″');
		}
		// and just beside a node, where a naive divided difference would lose every digit
		for (const v of [0.3 + 1e-12, 0.35 - 1e-13]) {
			const j = fit.evaluate(v);
			expectClose(j.df, dp(v), 1e-11, 'p′ near node');
			expectClose(j.d2f, d2p(v), 1e-10, 'p″ near node');
		}
	});

	it('local cubic reproduces cubics, local quadratic reproduces quadratics', () => {
		const x = unevenSmooth(12, 4).x;
		const c3 = (v: number) => 2 - v + 0.3 * v * v - 0.05 * v ** 3;
		const c2 = (v: number) => 2 - v + 0.3 * v * v;
		expect(maxError(fitCurve('local-cubic', x, x.map(c3)), c3)).toBeLessThan(1e-12);
		expect(maxError(fitCurve('local-quadratic', x, x.map(c2)), c2)).toBeLessThan(1e-12);
	});
});

describe('interpolants hit every data point', () => {
	const { x, y } = unevenRough(30, 5);
	for (const method of METHODS.filter((m) => curveMethods[m].interpolates)) {
		it(method, () => {
			const fit = fitCurve(method, x, y, optionsFor(method));
			const n = method === 'polynomial-global' ? 12 : x.length; // a degree-29 polynomial is hopeless; use 12 points
			const xs = x.slice(0, n);
			const ys = y.slice(0, n);
			const f = method === 'polynomial-global' ? fitCurve(method, xs, ys) : fit;
			for (let i = 0; i < n; i++) expectClose(f.evaluate(xs[i]).f, ys[i], 1e-13, `${method} row ${i}`);
		});
	}
	it('non-interpolating methods say so in the registry', () => {
		expect(METHODS.filter((m) => !curveMethods[m].interpolates).sort()).toEqual(['polynomial-least-squares', 'smoothing-spline', 'softened-linear']);
	});
});

describe('measured continuity equals declared continuity (non-trivial data)', () => {
	const rough = unevenRough(30, 21);
	const smooth = unevenSmooth(30, 22);
	for (const method of METHODS) {
		it(method, () => {
			for (const d of [rough, smooth]) {
				const fit = fitCurve(method, d.x, d.y, optionsFor(method));
				const a = auditSmoothness(fit);
				expect(a.declared).toBe(curveMethods[method].continuity);
				expect(a.measured).toBe(a.declared);
			}
		});
	}
});

describe('fit files round-trip bit for bit', () => {
	const { x, y } = unevenRough(20, 9);
	const probes = Array.from({ length: 257 }, (_, i) => x[0] - 1 + ((x[x.length - 1] - x[0] + 2) * i) / 256);
	for (const method of METHODS) {
		it(method, () => {
			const opts = { ...optionsFor(method), extrapolation: 'extend' as const };
			const xs = method === 'polynomial-global' ? x.slice(0, 10) : x;
			const fit = fitCurve(method, xs, y.slice(0, xs.length), opts);
			const text = JSON.stringify(fit.toJSON());
			const back = fitFromJSON(JSON.parse(text));
			const again = fitFromJSON(text);
			expect(JSON.stringify(back.toJSON())).toBe(text);
			expect(JSON.stringify(again.toJSON())).toBe(text);
			expect(back.method).toBe(fit.method);
			expect(back.continuity).toBe(fit.continuity);
			expect(back.extrapolation).toBe('extend');
			expect(back.domain).toEqual(fit.domain);
			expect(back.notes).toEqual(fit.notes);
			expect(sameBits(back.knots, fit.knots)).toBe(true);
			if (fit instanceof PiecewisePolynomial) expect(sameBits((back as PiecewisePolynomial).coefficients, fit.coefficients)).toBe(true);
			if (fit.stats.leverage) expect(sameBits(back.stats.leverage!, fit.stats.leverage)).toBe(true);
			const a = fit.evaluateMany(probes);
			const b = back.evaluateMany(probes);
			expect(sameBits(a.f, b.f) && sameBits(a.df, b.df) && sameBits(a.d2f, b.d2f)).toBe(true);
			expect(b.outside).toBe(a.outside);
			expect(a.outside).toBeGreaterThan(0);
		});
	}
	it('keeps −0, and reads the documented header', () => {
		const fit = fitCurve('linear', [0, 1, 2], [-0, -0, 1]);
		const j = fit.toJSON() as Record<string, unknown>;
		expect(j.format).toBe('kinkless-fit');
		expect(j.version).toBe(1);
		expect(j.representation).toBe('piecewise-polynomial');
		expect((j.coefficients as unknown[])[0]).toBe('-0');
		const back = fitFromJSON(JSON.stringify(j)) as PiecewisePolynomial;
		expect(Object.is(back.coefficients[0], -0)).toBe(true);
	});
	it('random data of every method survive the round trip (property)', () => {
		fc.assert(
			fc.property(
				fc.constantFrom(...METHODS),
				fc.uniqueArray(fc.double({ min: -1e3, max: 1e3, noNaN: true, noDefaultInfinity: true }), { minLength: 8, maxLength: 15 }),
				fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true }), { minLength: 15, maxLength: 15 }),
				(method, xs, ys) => {
					const x = [...xs].sort((a, b) => a - b);
					if (x.some((v, i) => i > 0 && v - x[i - 1] < 1e-3)) return true;
					const fit = fitCurve(method, x, ys.slice(0, x.length), optionsFor(method));
					const back = fitFromJSON(JSON.parse(JSON.stringify(fit)));
					const t = x.map((v, i) => (i + 1 < x.length ? 0.5 * (v + x[i + 1]) : v));
					const a = fit.evaluateMany(t);
					const b = back.evaluateMany(t);
					return sameBits(a.f, b.f) && sameBits(a.df, b.df) && sameBits(a.d2f, b.d2f);
				}
			),
			{ numRuns: 150, seed: 99 }
		);
	});
});

describe('evaluation paths', () => {
	const { x, y } = unevenRough(200, 31);
	for (const method of ['linear', 'pchip', 'local-quadratic', 'softened-linear'] as CurveMethod[]) {
		it(`${method}: sorted (cursor), shuffled (binary search) and single-point evaluation agree exactly`, () => {
			const fit = fitCurve(method, x, y, { ...optionsFor(method), extrapolation: 'linear' });
			const n = 5000;
			const sorted = Float64Array.from({ length: n }, (_, i) => x[0] - 2 + ((x[x.length - 1] - x[0] + 4) * i) / (n - 1));
			const perm = Array.from({ length: n }, (_, i) => (i * 7919) % n);
			const shuffled = Float64Array.from(perm, (p) => sorted[p]);
			const a = fit.evaluateMany(sorted);
			const b = fit.evaluateMany(shuffled);
			for (let i = 0; i < n; i++) {
				const p = perm[i];
				expect(Object.is(b.f[i], a.f[p]) && Object.is(b.df[i], a.df[p]) && Object.is(b.d2f[i], a.d2f[p])).toBe(true);
			}
			for (let i = 0; i < n; i += 97) {
				const j = fit.evaluate(sorted[i]);
				expect(Object.is(j.f, a.f[i]) && Object.is(j.df, a.df[i])).toBe(true);
			}
			expect(a.outside).toBe(b.outside);
			expect(a.outside).toBeGreaterThan(0);
		});
	}
	it('random points over very uneven knots (bucket index with empty and crowded buckets) match bisection', () => {
		// knots spread over 12 decades: most buckets are empty, the first holds hundreds of pieces
		const x = Array.from({ length: 400 }, (_, i) => 10 ** (-6 + (12 * i) / 399) - 1e-6);
		const y = x.map((v, i) => Math.sin(i) + Math.log1p(v));
		const fit = fitCurve('akima', x, y) as PiecewisePolynomial;
		const rnd = (s => () => ((s = (s * 16807) % 2147483647) / 2147483647))(12345);
		const pts = Float64Array.from({ length: 20000 }, (_, i) => (i % 3 === 0 ? x[Math.floor(rnd() * 400)] : i % 3 === 1 ? 1e-6 * rnd() : x[399] * rnd()));
		const r = fit.evaluateMany(pts);
		for (let p = 0; p < pts.length; p++) {
			const j = fit.evaluatePiece(fit.findPiece(pts[p]), pts[p]);
			expect(r.f[p] === j.f && r.df[p] === j.df && r.d2f[p] === j.d2f).toBe(true);
		}
	});
	it('evaluateValues equals evaluateMany(...).f for every method, in any order and outside the data', () => {
		const d = unevenRough(40, 17);
		const pts = Float64Array.from({ length: 3001 }, (_, i) => d.x[0] - 1 + ((d.x[39] - d.x[0] + 2) * ((i * 977) % 3001)) / 3000);
		for (const method of METHODS) {
			const xs = method === 'polynomial-global' ? d.x.slice(0, 10) : d.x;
			const fit = fitCurve(method, xs, d.y.slice(0, xs.length), { ...optionsFor(method), extrapolation: 'linear' });
			expect(sameBits(fit.evaluateValues(pts), fit.evaluateMany(pts).f)).toBe(true);
			const buf = new Float64Array(pts.length);
			expect(fit.evaluateValues(pts, buf)).toBe(buf);
		}
	});
	it('reuses caller buffers', () => {
		const fit = fitCurve('pchip', x, y);
		const f = new Float64Array(10);
		const r = fit.evaluateMany([x[0], x[1], x[2]], { f });
		expect(r.f).toBe(f);
		expect(r.df.length).toBe(3);
	});
	it('f′ and f″ at both end knots are the limits from inside (not from the extrapolation)', () => {
		for (const method of METHODS) {
			const fit = fitCurve(method, x.slice(0, 12), y.slice(0, 12), { ...optionsFor(method), extrapolation: 'hold' });
			const [a, b] = fit.domain;
			const ja = fit.evaluate(a);
			const jb = fit.evaluate(b);
			const ia = fit.evaluatePiece(0, a);
			const ib = fit.evaluatePiece(fit.pieces - 1, b);
			expect(ja.outside || jb.outside).toBe(false);
			expect([ja.df, ja.d2f, jb.df, jb.d2f]).toEqual([ia.df, ia.d2f, ib.df, ib.d2f]);
			// 'hold' outside has zero slope: the end knot must not be treated as outside
			expect(jb.df).not.toBe(0);
		}
	});
	it('PCHIP keeps random monotone data monotone (property)', () => {
		fc.assert(
			fc.property(fc.array(fc.tuple(fc.double({ min: 0.01, max: 3, noNaN: true }), fc.double({ min: 0, max: 5, noNaN: true })), { minLength: 3, maxLength: 30 }), (steps) => {
				const x = [0];
				const y = [0];
				for (const [dx, dy] of steps) {
					x.push(x[x.length - 1] + dx);
					y.push(y[y.length - 1] + dy);
				}
				const fit = fitCurve('pchip', x, y) as PiecewisePolynomial;
				const e = extremes(fit);
				if (e.min < -1e-12 || e.max > y[y.length - 1] * (1 + 1e-12) + 1e-12) return false;
				// f′ ≥ 0 on a dense grid
				const n = 20 * x.length;
				const t = Float64Array.from({ length: n }, (_, i) => Math.min((x[x.length - 1] * i) / (n - 1), x[x.length - 1]));
				const r = fit.evaluateMany(t);
				return r.df.every((d) => d >= -1e-12 * (1 + y[y.length - 1]));
			}),
			{ numRuns: 300, seed: 5 }
		);
	});
});
