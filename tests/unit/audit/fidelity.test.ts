/** Fidelity audit: leave-one-out, overshoot, monotonicity, spurious extrema, derivative check. */
import { describe, expect, it } from 'vitest';
import { expectClose } from '../../reference/tolerance';
import { auditFidelity } from '../../../src/lib/numerics/audit/fidelity';
import { curveMethods, fitCurve } from '../../../src/lib/numerics/fits';
import type { CurveFit, CurveFitOptions, CurveMethod, Jet } from '../../../src/lib/numerics/fits';
import { RPN14, SMOOTH25, unevenRough, unevenSmooth } from '../fits/fixtures';

describe('leave-one-out', () => {
	it('linear on y = x² at 0…4: hand computation (interior errors −1, end errors 2)', () => {
		const x = [0, 1, 2, 3, 4];
		const y = x.map((v) => v * v);
		const a = auditFidelity(fitCurve('linear', x, y), x, y);
		// Interior: the neighbours' mean is i² + 1 → error −1. Ends: the extended edge line
		// through (1,1),(2,4) gives −2 at 0, through (2,4),(3,9) gives 14 at 4 → error 2.
		expect(a.looMethod).toBe('refit');
		expect(a.looPoints).toBe(5);
		expectClose(a.looRmse, Math.sqrt(11 / 5), 1e-15);
		expect(a.looMax).toBe(2);
	});

	it('least squares: the closed form (hat matrix) equals brute-force refits', () => {
		const { x, y } = unevenRough(30, 3);
		const fit = fitCurve('polynomial-least-squares', x, y, { degree: 4 });
		const a = auditFidelity(fit, x, y);
		expect(a.looMethod).toBe('closed-form');
		const b = bruteLoo('polynomial-least-squares', x, y, { degree: 4 });
		expectClose(a.looRmse, b.rmse, 1e-10, 'rmse');
		expectClose(a.looMax, b.max, 1e-10, 'max');
	});

	it('smoothing spline at fixed λ: the closed form equals brute-force refits (Craven & Wahba 1979, Lemma 3.1)', () => {
		const { x, y } = SMOOTH25;
		for (const lambda of [0.003, 0.0657, 1]) {
			const fit = fitCurve('smoothing-spline', x, y, { lambda });
			const a = auditFidelity(fit, x, y);
			expect(a.looMethod).toBe('closed-form');
			const b = bruteLoo('smoothing-spline', x, y, { lambda });
			expectClose(a.looRmse, b.rmse, 1e-9, `rmse λ=${lambda}`);
			expectClose(a.looMax, b.max, 1e-9, `max λ=${lambda}`);
		}
	});

	it('weighted smoothing spline: closed form equals refits too', () => {
		const { x, y } = unevenSmooth(20, 8, (t) => Math.sin(t) + 0.1 * Math.cos(13 * t));
		const weights = x.map((_, i) => 0.5 + (i % 3));
		const a = auditFidelity(fitCurve('smoothing-spline', x, y, { lambda: 0.2, weights }), x, y);
		const b = bruteLoo('smoothing-spline', x, y, { lambda: 0.2 }, weights);
		expectClose(a.looRmse, b.rmse, 1e-9);
	});

	it.each(['linear', 'pchip', 'akima-modified', 'local-quadratic', 'local-cubic', 'softened-linear', 'akima', 'cubic-not-a-knot'] as CurveMethod[])(
		'%s: refits (windowed for local methods) equal full brute-force refits',
		(method) => {
			const { x, y } = unevenRough(40, 23);
			const a = auditFidelity(fitCurve(method, x, y), x, y);
			const b = bruteLoo(method, x, y, {});
			expect(a.looMethod).toBe('refit');
			expectClose(a.looRmse, b.rmse, 1e-12, 'rmse');
			expectClose(a.looMax, b.max, 1e-12, 'max');
		}
	);

	it('refits on large tables use an evenly spread subset and say so', () => {
		const { x, y } = unevenSmooth(500, 2);
		const a = auditFidelity(fitCurve('pchip', x, y), x, y, { looMaxPoints: 50 });
		expect(a.looPoints).toBe(50);
		expect(a.notes.join(' ')).toMatch(/50 of 500 rows/);
		expect(a.looRmse).toBeGreaterThan(0);
		expect(a.looRmse).toBeLessThan(0.5); // spacing up to ~1 on a gently curved line
	});
});

function bruteLoo(method: CurveMethod, x: number[], y: number[], options: CurveFitOptions, weights?: number[]): { rmse: number; max: number } {
	let s = 0;
	let max = 0;
	for (let i = 0; i < x.length; i++) {
		const keep = (_: unknown, j: number) => j !== i;
		// the smoothing spline's minimiser continues linearly beyond the data
		const f = fitCurve(method, x.filter(keep), y.filter(keep), { ...options, extrapolation: method === 'smoothing-spline' ? 'linear' : 'extend', ...(weights ? { weights: weights.filter(keep) } : {}) });
		const e = y[i] - f.evaluate(x[i]).f;
		s += e * e;
		max = Math.max(max, Math.abs(e));
	}
	return { rmse: Math.sqrt(s / x.length), max };
}

describe('overshoot and monotonicity on the RPN 14 data', () => {
	// Fritsch & Carlson (1980) data, corroborated; the fit extrema are computed values from docs/references.md.
	it('PCHIP: no overshoot, monotone kept, no spurious extrema', () => {
		const a = auditFidelity(fitCurve('pchip', RPN14.x, RPN14.y), RPN14.x, RPN14.y);
		expect(a.dataMonotone).toBe('increasing');
		expect(a.overshoot).toBeLessThanOrEqual(1e-15);
		expect(a.monotoneKept).toBe(true);
		expect(a.spuriousExtrema).toBe(0);
	});
	it('natural spline: overshoot 1.10118820029533659 − 0.998636 on [10, 12] (computed), monotonicity broken', () => {
		const a = auditFidelity(fitCurve('cubic-natural', RPN14.x, RPN14.y), RPN14.x, RPN14.y);
		// computed: max of the natural spline is 1 + 0.10118820029533659 at x ≈ 10.8764; the larger neighbour there is 0.998636
		expectClose(a.overshoot, 1.10118820029533659 - 0.998636, 1e-8);
		expect(Math.abs(a.overshootAt! - 10.8764)).toBeLessThan(1e-3);
		expect(a.monotoneKept).toBe(false);
		expect(a.monotoneWorst).toBeGreaterThan(0);
		// every turn of the fit is spurious (the data never turn): the dip near 8.05 and the bump near 10.9 among them
		expect(a.spuriousExtrema).toBeGreaterThanOrEqual(2);
		expect(a.spuriousAt.some((v) => Math.abs(v - 8.048) < 0.02)).toBe(true);
		expect(a.spuriousAt.some((v) => Math.abs(v - 10.876) < 0.02)).toBe(true);
	});
	it('Akima: overshoot 1.098367669582513084 − 0.998636 (computed)', () => {
		const a = auditFidelity(fitCurve('akima', RPN14.x, RPN14.y), RPN14.x, RPN14.y);
		expectClose(a.overshoot, 1.098367669582513084 - 0.998636, 1e-8);
		expect(a.monotoneKept).toBe(false);
	});
	it('linear interpolation never overshoots and keeps monotonicity', () => {
		const a = auditFidelity(fitCurve('linear', RPN14.x, RPN14.y), RPN14.x, RPN14.y);
		expect(a.overshoot).toBe(0);
		expect(a.monotoneKept).toBe(true);
		expect(a.spuriousExtrema).toBe(0);
	});
});

describe('extrema', () => {
	it('a genuine peak is not spurious, for every interpolating method', () => {
		const x = [0, 0.4, 1.1, 1.5, 2.2, 2.6, 3.1];
		const y = x.map(Math.sin);
		for (const m of ['linear', 'cubic-natural', 'cubic-not-a-knot', 'akima', 'akima-modified', 'pchip', 'local-quadratic', 'local-cubic', 'polynomial-global', 'softened-linear'] as CurveMethod[]) {
			const a = auditFidelity(fitCurve(m, x, y), x, y);
			expect(a.dataMonotone).toBe(null);
			expect(a.monotoneKept).toBe(true);
			expect(a.spuriousExtrema, m).toBe(0);
		}
	});
	it('ringing of the global polynomial shows up as spurious extrema', () => {
		const x = Array.from({ length: 15 }, (_, i) => -1 + (2 * i) / 14);
		const y = x.map((v) => 1 / (1 + 25 * v * v)); // Runge's function: one peak
		const a = auditFidelity(fitCurve('polynomial-global', x, y), x, y);
		expect(a.spuriousExtrema).toBeGreaterThanOrEqual(4);
		expect(a.overshoot).toBeGreaterThan(1);
	});
});

describe('derivative check', () => {
	it('analytic f′ and f″ agree with central differences for every method (≤ 1e-7 of the largest derivative)', () => {
		const { x, y } = unevenRough(20, 13);
		for (const m of Object.keys(curveMethods) as CurveMethod[]) {
			const o = m === 'cubic-clamped' ? { slopes: [1, 2] as [number, number] } : m === 'smoothing-spline' ? { lambda: 0.01 } : {};
			// A degree-19 polynomial through rough data reaches 1e8 between clustered nodes, where no
			// finite difference is trustworthy; the global polynomial gets smooth data instead.
			const d = m === 'polynomial-global' ? unevenSmooth(8, 13) : { x, y };
			const a = auditFidelity(fitCurve(m, d.x, d.y, o), d.x, d.y, { seed: 3 });
			expect(a.derivativeCheck.points).toBe(200);
			expect(a.derivativeCheck.worstD1, m).toBeLessThan(1e-7);
			expect(a.derivativeCheck.worstD2, m).toBeLessThan(1e-7);
		}
	});
	it('catches a wrong derivative (a fit whose f′ is 1% off)', () => {
		const good = fitCurve('cubic-natural', RPN14.x, RPN14.y);
		const tamper = (j: Jet): Jet => ({ ...j, df: 1.01 * j.df });
		const bad: CurveFit = Object.assign(Object.create(Object.getPrototypeOf(good)), good, {
			evaluatePiece: (i: number, v: number) => tamper(good.evaluatePiece(i, v)),
			evaluate: (v: number) => tamper(good.evaluate(v))
		});
		const a = auditFidelity(bad, RPN14.x, RPN14.y);
		expect(a.derivativeCheck.worstD1).toBeGreaterThan(1e-3);
		expect(a.derivativeCheck.worstD2).toBeGreaterThan(1e-3); // f″ no longer matches the (scaled) f′
	});
	it('is reproducible for a given seed', () => {
		const f = fitCurve('akima', RPN14.x, RPN14.y);
		expect(auditFidelity(f, RPN14.x, RPN14.y, { seed: 9 }).derivativeCheck).toEqual(auditFidelity(f, RPN14.x, RPN14.y, { seed: 9 }).derivativeCheck);
	});
});
