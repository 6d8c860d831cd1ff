/** Smoothing-spline properties beyond the published table (regression fixtures included). */
import { describe, expect, it } from 'vitest';
import { expectClose } from '../../reference/tolerance';
import { fitCurve, polynomialLeastSquares, smoothingSpline } from '../../../src/lib/numerics/fits';
import { mulberry32 } from '../../../src/lib/numerics/math';
import { SMOOTH25, unevenSmooth } from './fixtures';

describe('smoothing spline', () => {
	it('very large λ tends to the least-squares straight line (tr A → 2)', () => {
		const { x, y } = SMOOTH25;
		const s = smoothingSpline(x, y, { lambda: 1e9 });
		const line = polynomialLeastSquares(x, y, { degree: 1 });
		expect(s.stats.edf!).toBeLessThan(2 + 1e-6);
		for (const v of [0, 1.7, 3.3, 6]) expectClose(s.evaluate(v).f, line.evaluate(v).f, 1e-6);
	});
	it('scaling every weight by c and λ by c leaves the fit unchanged', () => {
		const { x, y } = unevenSmooth(30, 4, (t) => Math.sin(t) + 0.1 * Math.cos(17 * t));
		const w = x.map((_, i) => 1 + (i % 4));
		const a = smoothingSpline(x, y, { lambda: 0.3, weights: w });
		const b = smoothingSpline(x, y, { lambda: 0.3 * 7, weights: w.map((v) => 7 * v) });
		for (let v = x[0]; v <= x[x.length - 1]; v += 0.37) expectClose(a.evaluate(v).f, b.evaluate(v).f, 1e-11);
	});
	it("averaging duplicates with their counts as weights equals fitting the repeated rows' means", () => {
		const x = [0, 1, 1, 2, 3, 3, 3, 4, 5];
		const y = [0, 1, 3, 1, 2, 4, 3, 0, 1];
		const a = fitCurve('smoothing-spline', x, y, { lambda: 0.5, duplicates: 'average' });
		const b = fitCurve('smoothing-spline', [0, 1, 2, 3, 4, 5], [0, 2, 1, 3, 0, 1], { lambda: 0.5, weights: [1, 2, 1, 3, 1, 1] });
		for (let v = 0; v <= 5; v += 0.25) expectClose(a.evaluate(v).f, b.evaluate(v).f, 1e-13);
	});
	it('regression: GCV on 20 000 noisy points finishes and picks a sensible λ (λ near the top of the scan is not positive definite)', () => {
		const r = mulberry32(77);
		const n = 20000;
		const x = new Float64Array(n);
		const y = new Float64Array(n);
		let t = 0;
		for (let i = 0; i < n; i++) {
			t += 0.2 + r();
			x[i] = t;
			y[i] = Math.sin(t / 300) + 0.1 * (r() - 0.5);
		}
		const t0 = performance.now();
		const s = smoothingSpline(x, y);
		expect(performance.now() - t0).toBeLessThan(20_000);
		expect(s.stats.edf!).toBeGreaterThan(2);
		expect(s.stats.edf!).toBeLessThan(n / 4);
		// it smooths: the residual RMS is near the noise level (0.1/√12 ≈ 0.029)
		expect(Math.sqrt(s.stats.rss! / n)).toBeGreaterThan(0.02);
		expect(Math.sqrt(s.stats.rss! / n)).toBeLessThan(0.04);
	});
	it('exact data: GCV keeps (almost) all of it', () => {
		const { x, y } = unevenSmooth(40, 6);
		const s = smoothingSpline(x, y);
		for (let i = 0; i < x.length; i++) expect(Math.abs(s.evaluate(x[i]).f - y[i])).toBeLessThan(1e-3);
	});
});
