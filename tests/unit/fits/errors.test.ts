/** Bad input becomes a typed FitError (code, message, rows); recoverable quirks become notes. */
import { describe, expect, it } from 'vitest';
import { curveMethods, FitError, fitCurve, fitFromJSON } from '../../../src/lib/numerics/fits';
import type { CurveMethod } from '../../../src/lib/numerics/fits';

function fitError(fn: () => unknown): FitError {
	try {
		fn();
	} catch (e) {
		expect(e).toBeInstanceOf(FitError);
		return e as FitError;
	}
	throw new Error('expected a FitError');
}

const METHODS = Object.keys(curveMethods) as CurveMethod[];

describe('too few points', () => {
	const need: Record<CurveMethod, number> = {
		linear: 2,
		'cubic-natural': 2,
		'cubic-not-a-knot': 2,
		'cubic-clamped': 2,
		akima: 3,
		'akima-modified': 3,
		pchip: 2,
		'local-quadratic': 3,
		'local-cubic': 4,
		'polynomial-global': 2,
		'polynomial-least-squares': 2,
		'smoothing-spline': 5,
		'softened-linear': 2
	};
	it.each(METHODS)('%s says how many it needs', (method) => {
		const n = need[method] - 1;
		const x = Array.from({ length: n }, (_, i) => i);
		const opts = method === 'cubic-clamped' ? { slopes: [0, 0] as [number, number] } : method === 'polynomial-least-squares' ? { degree: 0 } : {};
		const e = fitError(() => fitCurve(method, x, x, opts));
		expect(e.code).toBe('too-few-points');
		expect(e.message).toContain(`at least ${need[method]}`);
		expect(e.message).toContain(`got ${n}`);
		// and with exactly enough it works
		const x2 = Array.from({ length: need[method] }, (_, i) => i);
		expect(() => fitCurve(method, x2, x2.map((v) => v * v), opts)).not.toThrow();
	});
	it('smoothing-spline at a fixed λ needs only 3', () => {
		expect(() => fitCurve('smoothing-spline', [0, 1, 2], [0, 1, 0], { lambda: 0.1 })).not.toThrow();
		expect(fitError(() => fitCurve('smoothing-spline', [0, 1], [0, 1], { lambda: 0.1 })).message).toContain('at least 3');
	});
});

describe('duplicate x', () => {
	const x = [0, 1, 2, 1, 3, 3, 3];
	const y = [0, 1, 4, 3, 9, 8, 10];
	it('lists the rows (1-based) of every repeated x', () => {
		const e = fitError(() => fitCurve('pchip', x, y));
		expect(e.code).toBe('duplicate-x');
		expect(e.rows).toEqual([2, 4, 5, 6, 7]);
		expect(e.message).toContain('rows 2, 4, 5, 6, 7');
	});
	it("duplicates: 'average' merges each group into its mean and notes it", () => {
		const fit = fitCurve('linear', x, y, { duplicates: 'average' });
		expect(Array.from(fit.knots)).toEqual([0, 1, 2, 3]);
		expect(fit.evaluate(1).f).toBe(2);
		expect(fit.evaluate(3).f).toBe(9);
		expect(fit.notes.join(' ')).toMatch(/averaged 2 groups/);
	});
	it('averaged means carry their group weight in the least-squares methods (same fit as keeping every row)', () => {
		const xs = [0, 0, 1, 2, 2, 2, 3, 4];
		const ys = [1, 2, 0.5, 3, 2, 4, 1, 0];
		const avg = fitCurve('polynomial-least-squares', xs, ys, { degree: 2, duplicates: 'average' });
		// weighted by counts, the merged problem has the same minimiser as the full one
		const ux = [0, 1, 2, 3, 4];
		const uy = [1.5, 0.5, 3, 1, 0];
		const w = [2, 1, 3, 1, 1];
		const weighted = fitCurve('polynomial-least-squares', ux, uy, { degree: 2, weights: w });
		for (const t of [0, 0.7, 2.2, 4]) expect(avg.evaluate(t).f).toBeCloseTo(weighted.evaluate(t).f, 13);
	});
});

describe('non-finite values', () => {
	it('lists the rows with NaN or ±Infinity', () => {
		const e = fitError(() => fitCurve('akima', [0, 1, NaN, 3, 4], [0, 1, 2, Infinity, -Infinity]));
		expect(e.code).toBe('non-finite');
		expect(e.rows).toEqual([3, 4, 5]);
		expect(e.message).toContain('rows 3, 4, 5');
	});
	it('refuses null, booleans and numeric strings on the fast path and the checked path alike, naming the rows (never read as 0 or converted)', () => {
		const X = [0, 1, 2, 3, 4, 5];
		const Y = [0, 1, 4, 9, 16, 25];
		for (const bad of [null, true, false, '3', undefined]) {
			for (const [x, y] of [
				[X.map((v, i) => (i === 2 ? bad : v)), Y],
				[X, Y.map((v, i) => (i === 2 ? bad : v))]
			]) {
				for (const method of ['linear', 'pchip', 'cubic-natural', 'polynomial-least-squares'] as const) {
					const e = fitError(() => fitCurve(method, x as number[], y as number[]));
					expect(e.code, `${method} ${String(bad)}`).toBe('non-finite');
					expect(e.rows).toEqual([3]);
					expect(e.message).toMatch(/not a number .* row 3/);
					// also with nonFinite: 'drop' — a value of the wrong type is not a missing number
					expect(fitError(() => fitCurve(method, x as number[], y as number[], { nonFinite: 'drop' })).code).toBe('non-finite');
				}
			}
		}
	});
	it("nonFinite: 'drop' leaves the rows out and says so", () => {
		const fit = fitCurve('linear', [0, 1, NaN, 3], [0, 1, 2, 3], { nonFinite: 'drop' });
		expect(Array.from(fit.knots)).toEqual([0, 1, 3]);
		expect(fit.notes[0]).toMatch(/dropped 1 row .*rows 3/);
	});
	it('a NaN cannot spread: dropping it leaves the other rows exact', () => {
		const fit = fitCurve('cubic-natural', [0, 1, 2, 3, 4], [0, 1, NaN, 9, 16], { nonFinite: 'drop' });
		for (const v of [0, 1, 3, 4]) expect(Number.isFinite(fit.evaluate(v).f)).toBe(true);
	});
});

describe('method-specific options', () => {
	it('degree ≥ number of points', () => {
		const e = fitError(() => fitCurve('polynomial-least-squares', [0, 1, 2, 3], [1, 2, 0, 1], { degree: 4 }));
		expect(e.code).toBe('degree-too-high');
		expect(e.message).toContain('at least 5');
		expect(() => fitCurve('polynomial-least-squares', [0, 1, 2, 3], [1, 2, 0, 1], { degree: 3 })).not.toThrow();
		expect(fitError(() => fitCurve('polynomial-least-squares', [0, 1, 2], [1, 2, 0], { degree: 1.5 })).code).toBe('bad-option');
	});
	it('clamped without slopes', () => {
		expect(fitError(() => fitCurve('cubic-clamped', [0, 1, 2], [0, 1, 0])).code).toBe('missing-slopes');
		expect(fitError(() => fitCurve('cubic-clamped', [0, 1, 2], [0, 1, 0], { slopes: [0, NaN] })).code).toBe('missing-slopes');
	});
	it.each([0, -0.5, NaN, Infinity])('softening width %s is refused', (w) => {
		const e = fitError(() => fitCurve('softened-linear', [0, 1, 2], [0, 1, 0], { width: w }));
		expect(e.code).toBe('bad-width');
	});
	it('a negative λ is refused', () => {
		expect(fitError(() => fitCurve('smoothing-spline', [0, 1, 2, 3], [0, 1, 0, 1], { lambda: -1 })).code).toBe('bad-option');
	});
	it('weights only where a method uses them, positive and one per row', () => {
		expect(fitError(() => fitCurve('pchip', [0, 1, 2], [0, 1, 0], { weights: [1, 1, 1] })).code).toBe('bad-option');
		expect(fitError(() => fitCurve('smoothing-spline', [0, 1, 2], [0, 1, 0], { lambda: 1, weights: [1, 1] })).code).toBe('length-mismatch');
		expect(fitError(() => fitCurve('smoothing-spline', [0, 1, 2], [0, 1, 0], { lambda: 1, weights: [1, 0, 1] })).rows).toEqual([2]);
	});
	it('bad shared options', () => {
		expect(fitError(() => fitCurve('linear', [0, 1], [0, 1], { extrapolation: 'wrap' as never })).code).toBe('bad-option');
		expect(fitError(() => fitCurve('linear', [0, 1], [0, 1], { duplicates: 'first' as never })).code).toBe('bad-option');
	});
});

describe('shape of the input', () => {
	it('x and y of different lengths', () => {
		expect(fitError(() => fitCurve('linear', [0, 1, 2], [0, 1])).code).toBe('length-mismatch');
	});
	it('unknown method', () => {
		expect(fitError(() => fitCurve('spline' as CurveMethod, [0, 1], [0, 1])).code).toBe('unknown-method');
	});
	it('unsorted x is sorted, with a note, and gives the same fit as sorted input', () => {
		const x = [3, 0, 2, 1, 4];
		const y = [9, 0, 4, 1, 16];
		const a = fitCurve('akima', x, y);
		const b = fitCurve('akima', [0, 1, 2, 3, 4], [0, 1, 4, 9, 16]);
		expect(a.notes).toContain('x was not in increasing order; the rows were sorted by x');
		expect(b.notes).toEqual([]);
		for (let t = 0; t <= 4; t += 0.25) expect(a.evaluate(t)).toEqual(b.evaluate(t));
	});
	it('accepts typed arrays and plain arrays alike', () => {
		const a = fitCurve('pchip', Float64Array.from([0, 1, 2, 3]), Float32Array.from([0, 1, 0.5, 2]));
		const b = fitCurve('pchip', [0, 1, 2, 3], [0, 1, 0.5, 2]);
		expect(a.evaluate(1.3)).toEqual(b.evaluate(1.3));
	});
});

describe('extrapolation rules', () => {
	const x = [0, 1, 2, 4];
	const y = [1, 3, 2, 5];
	it("'refuse' (the default) throws outside-domain; the domain ends themselves are inside", () => {
		const fit = fitCurve('pchip', x, y);
		expect(fit.extrapolation).toBe('refuse');
		expect(fit.evaluate(0).outside).toBe(false);
		expect(fit.evaluate(4).outside).toBe(false);
		const e = fitError(() => fit.evaluate(4.0000001));
		expect(e.code).toBe('outside-domain');
		expect(fitError(() => fit.evaluateMany([1, 2, -1])).code).toBe('outside-domain');
	});
	it("'hold' keeps the end value with zero slope", () => {
		const fit = fitCurve('cubic-natural', x, y, { extrapolation: 'hold' });
		expect(fit.evaluate(-3)).toEqual({ f: 1, df: 0, d2f: 0, outside: true });
		expect(fit.evaluate(9).f).toBe(5);
	});
	it("'linear' continues along the end slope", () => {
		const fit = fitCurve('cubic-natural', x, y, { extrapolation: 'linear' });
		const e = fit.evaluate(4);
		const j = fit.evaluate(6);
		expect(j.outside).toBe(true);
		expect(j.df).toBe(e.df);
		expect(j.d2f).toBe(0);
		expect(j.f).toBeCloseTo(e.f + 2 * e.df, 13);
	});
	it('f(±∞) under linear and extend: the edge value where the edge slope is 0 (never NaN), else ±∞ with the sign of the slope (common practice, no source)', () => {
		// flat ends: linear through [1, 1, 3, 3] has slope 0 on its first and last piece
		const flatX = [0, 1, 2, 3];
		const flatY = [1, 1, 3, 3];
		for (const rule of ['linear', 'extend'] as const) {
			for (const method of ['linear', 'pchip'] as const) {
				const fit = fitCurve(method, flatX, flatY, { extrapolation: rule });
				expect(fit.evaluate(-Infinity), `${method} ${rule}`).toEqual({ f: 1, df: 0, d2f: 0, outside: true });
				expect(fit.evaluate(Infinity), `${method} ${rule}`).toEqual({ f: 3, df: 0, d2f: 0, outside: true });
				expect(Array.from(fit.evaluateMany([-Infinity, Infinity]).f)).toEqual([1, 3]);
			}
			// a rising linear end goes to +∞ on the right and −∞ on the left
			const up = fitCurve('linear', [0, 1, 2], [0, 1, 2], { extrapolation: rule });
			expect(up.evaluate(Infinity).f).toBe(Infinity);
			expect(up.evaluate(-Infinity).f).toBe(-Infinity);
			expect(up.evaluate(Infinity).df).toBe(1);
		}
		// a straight least-squares line with zero slope (constant data)
		const lsq = fitCurve('polynomial-least-squares', [0, 1, 2, 3], [2, 2, 2, 2], { degree: 2, extrapolation: 'extend' });
		expect(lsq.evaluate(Infinity).f).toBe(2);
		expect(lsq.evaluate(-Infinity).df === 0).toBe(true); // ±0: the data are constant
		expect(fitCurve('polynomial-least-squares', [0, 1, 2, 3], [2, 2, 2, 2], { degree: 1, extrapolation: 'linear' }).evaluate(-Infinity).f).toBe(2);
	});
	it("'extend' evaluates the edge piece", () => {
		const fit = fitCurve('cubic-natural', x, y, { extrapolation: 'extend' });
		const j = fit.evaluate(-0.5);
		const p = fit.evaluatePiece(0, -0.5);
		expect(j).toEqual({ ...p, outside: true });
	});
	it.each(['polynomial-global', 'polynomial-least-squares'] as CurveMethod[])('%s honours the rules too', (method) => {
		const o = method === 'polynomial-least-squares' ? { degree: 2 } : {};
		expect(fitError(() => fitCurve(method, x, y, o).evaluate(5)).code).toBe('outside-domain');
		expect(fitCurve(method, x, y, { ...o, extrapolation: 'hold' }).evaluate(5).df).toBe(0);
		const lin = fitCurve(method, x, y, { ...o, extrapolation: 'linear' });
		expect(lin.evaluate(5).df).toBe(lin.evaluate(4).df);
		const ext = fitCurve(method, x, y, { ...o, extrapolation: 'extend' });
		expect(ext.evaluate(5).f).toBe(ext.evaluatePiece(0, 5).f);
		expect(ext.evaluateMany([5, -1]).outside).toBe(2);
	});
	it('NaN as a point is an invalid-point error under every rule', () => {
		for (const extrapolation of ['refuse', 'hold', 'linear', 'extend'] as const) {
			expect(fitError(() => fitCurve('linear', x, y, { extrapolation }).evaluate(NaN)).code).toBe('invalid-point');
		}
	});
});

describe('fit files that are not ours', () => {
	const good = JSON.parse(JSON.stringify(fitCurve('pchip', [0, 1, 2], [0, 1, 4]).toJSON()));
	it.each([
		['not JSON', '{'],
		['another format', { ...good, format: 'other' }],
		['a future version', { ...good, version: 2 }],
		['an unknown method', { ...good, method: 'magic' }],
		['knots out of order', { ...good, knots: [0, 2, 1] }],
		['too few coefficients', { ...good, coefficients: [1, 2] }],
		['a non-number', { ...good, knots: [0, 'x', 2] }],
		['a wrong domain', { ...good, domain: [0, 3] }],
		['an unknown representation', { ...good, representation: 'spline-tree' }]
	])('%s → bad-fit-file', (_, json) => {
		expect(fitError(() => fitFromJSON(json)).code).toBe('bad-fit-file');
	});
});
