/**
 * Surface fit files: every grid method and every RBF kernel (with each tail
 * degree) survives toJSON → JSON text → surfaceFromJSON with bitwise-equal
 * value, gradient and Hessian at random points (inside, on grid lines and,
 * where the fit allows it, outside). Reference: the fit before the round trip
 * (a file format must lose nothing; common practice, no source). A changed
 * version, format, method or representation is refused with a message naming it.
 */
import { describe, expect, it } from 'vitest';
import { FitError, fitFromJSON, fitGrid, fitScatter, gridMethods, surfaceFromJSON } from '../../../src/lib/numerics/fits';
import type { GridMethod, ScatterMethod, SurfaceFit, SurfaceFitOptions } from '../../../src/lib/numerics/fits';
import { rng, tabulate, unevenAxis } from './helpers';

const GRID_METHODS = Object.keys(gridMethods) as GridMethod[];
const KERNELS: ScatterMethod[] = ['rbf-thin-plate', 'rbf-multiquadric', 'rbf-gaussian'];

function sameBits(a: SurfaceFit, b: SurfaceFit, points: number[][], label: string): number {
	let n = 0;
	for (const p of points) {
		const ea = a.evaluate(p);
		const eb = b.evaluate(p);
		expect(Object.is(eb.f, ea.f), `${label} f at ${p}`).toBe(true);
		expect(Array.from(eb.grad), `${label} grad at ${p}`).toEqual(Array.from(ea.grad));
		expect(Array.from(eb.hess), `${label} hess at ${p}`).toEqual(Array.from(ea.hess));
		expect(eb.outside).toBe(ea.outside);
		const ga = new Float64Array(p.length);
		const gb = new Float64Array(p.length);
		expect(Object.is(b.valueGradient(p, gb), a.valueGradient(p, ga))).toBe(true);
		expect(Array.from(gb)).toEqual(Array.from(ga));
		expect(Object.is(b.value(p), a.value(p))).toBe(true);
		n += 1;
	}
	return n;
}

function roundTrip(fit: SurfaceFit): SurfaceFit {
	const text = JSON.stringify(fit.toJSON());
	const back = surfaceFromJSON(JSON.parse(text));
	// the text form is read the same way
	expect(JSON.stringify(surfaceFromJSON(text).toJSON())).toBe(text);
	expect(JSON.stringify(back.toJSON())).toBe(text);
	return back;
}

describe('grid fit files round-trip bit for bit', () => {
	for (const d of [2, 3]) {
		const axes = Array.from({ length: d }, (_, k) => unevenAxis(5 + k, -1 - k, 2 + k, 10 + k));
		const values = tabulate(axes, (x) => Math.sin(x[0]) * Math.exp(0.3 * x[1]) + (d > 2 ? x[2] * x[0] : 0));
		const r = rng(d);
		const inside = Array.from({ length: 200 }, () => axes.map((a) => a[0] + (a[a.length - 1] - a[0]) * r()));
		// on grid lines: one input exactly on an interior grid value
		const onLines = axes.flatMap((a, k) => a.slice(1, -1).map((v) => inside[k].map((u, j) => (j === k ? v : u))));
		const outside = inside.slice(0, 40).map((p) => p.map((v, k) => (k === 0 ? axes[0][0] - 0.5 - v : v)));
		for (const m of GRID_METHODS) {
			for (const extrapolation of ['refuse', 'extend'] as const) {
				it(`${m}, ${d} inputs, extrapolation ${extrapolation}`, () => {
					const fit = fitGrid(m, axes, values, { extrapolation });
					const back = roundTrip(fit);
					expect(back.method).toBe(m);
					expect(back.continuity).toBe(fit.continuity);
					expect(back.extrapolation).toBe(extrapolation);
					expect(back.domain).toEqual(fit.domain);
					const n = sameBits(fit, back, [...inside, ...onLines], m);
					expect(n).toBe(inside.length + onLines.length);
					if (extrapolation === 'extend') sameBits(fit, back, outside, `${m} outside`);
					else expect(() => back.evaluate(outside[0])).toThrowError(/input 1 = .* lies outside/);
				});
			}
		}
	}
});

describe('RBF fit files round-trip bit for bit', () => {
	const r = rng(7);
	const x = Array.from({ length: 30 }, () => [-2 + 3 * r(), 1 + 5 * r(), 10 * r()]);
	const y = x.map(([a, b, c]) => Math.sin(a) + 0.1 * b * b - 0.05 * c);
	const pts = [...Array.from({ length: 150 }, () => [-2.5 + 4 * r(), 0 + 7 * r(), -1 + 12 * r()]), ...x.slice(0, 5)];
	for (const method of KERNELS) {
		for (const options of [{ degree: 1 }, { degree: 0, smoothing: 1e-3 }, { degree: -1, epsilon: 2 }] as SurfaceFitOptions[]) {
			it(`${method} ${JSON.stringify(options)}`, () => {
				const fit = fitScatter(method, x, y, options);
				const back = roundTrip(fit);
				expect(back.method).toBe(method);
				expect(back.options).toEqual(fit.options);
				expect(back.domain).toEqual(fit.domain);
				expect(back.continuity).toBe(fit.continuity);
				expect(back.hessian).toBe(fit.hessian);
				expect(back.stats.condition).toBe(fit.stats.condition);
				expect(sameBits(fit, back, pts, method)).toBe(pts.length);
			});
		}
	}
});

describe('surface fit files: tampered envelopes are refused with a clear message', () => {
	const grid = fitGrid('grid-pchip', [[0, 1, 2], [0, 1, 2]], [0, 1, 2, 1, 2, 3, 2, 3, 5]).toJSON() as Record<string, unknown>;
	const rbf = fitScatter('rbf-gaussian', [[0, 0], [1, 0], [0, 1], [1, 1], [0.5, 0.4]], [0, 1, 1, 2, 0.7]).toJSON() as Record<string, unknown>;
	function message(fn: () => unknown): string {
		try {
			fn();
		} catch (e) {
			expect(e).toBeInstanceOf(FitError);
			expect((e as FitError).code).toBe('bad-fit-file');
			return (e as FitError).message;
		}
		return 'no error';
	}
	it.each([
		['version 2', { version: 2 }, /version 2 is not supported \(this reader knows version 1\)/],
		['version "1"', { version: '1' }, /version "1" is not supported/],
		['other format', { format: 'something-else' }, /format must be "kinkless-fit"/],
		['unknown representation', { representation: 'spline-mesh' }, /representation "spline-mesh" is not a surface fit/]
	])('%s', (_l, patch, re) => {
		for (const body of [grid, rbf]) expect(message(() => surfaceFromJSON({ ...body, ...patch }))).toMatch(re);
	});
	it('unknown methods, a wrong rule and damaged arrays', () => {
		expect(message(() => surfaceFromJSON({ ...grid, method: 'grid-quintic' }))).toMatch(/unknown grid method "grid-quintic"/);
		expect(message(() => surfaceFromJSON({ ...rbf, method: 'rbf-cubic' }))).toMatch(/unknown scattered method "rbf-cubic"/);
		expect(message(() => surfaceFromJSON({ ...grid, extrapolation: 'hold' }))).toMatch(/extrapolation must be "refuse" or "extend"/);
		expect(message(() => surfaceFromJSON({ ...grid, cubic: false }))).toMatch(/"cubic" does not match method grid-pchip/);
		expect(message(() => surfaceFromJSON({ ...grid, data: (grid.data as number[]).slice(1) }))).toMatch(/expected 36 numbers, got 35/);
		expect(message(() => surfaceFromJSON({ ...rbf, tail: [1, 2] }))).toMatch(/tail must have 0, 1 or 3 coefficients, got 2/);
		expect(message(() => surfaceFromJSON({ ...rbf, span: [1, 0] }))).toMatch(/span\[1\] must be a finite number > 0/);
		expect(message(() => surfaceFromJSON({ ...rbf, coefficients: ['x', 1, 2, 3, 4] }))).toMatch(/coefficients\[0\] is not a number/);
		expect(message(() => surfaceFromJSON('{not json'))).toMatch(/not valid JSON/);
	});
	it('the curve reader points a surface file to the surface reader', () => {
		expect(message(() => fitFromJSON(grid))).toMatch(/surface fit .* surfaceFromJSON/);
		expect(message(() => fitFromJSON(JSON.stringify(rbf)))).toMatch(/surface fit .* surfaceFromJSON/);
	});
});
