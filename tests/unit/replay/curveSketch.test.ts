// What the replay draws of a fit: samples with exact one-sided limits at the
// knots, the kinks, and the one-sentence reason. References: a linear
// interpolant's slopes are the secants (y[i+1] − y[i])/(x[i+1] − x[i]), by
// definition (exact arithmetic); Akima's and PCHIP's are C1 by construction
// (Akima 1970; Fritsch & Carlson 1980), so f′ has no jump but f″ does.
import { describe, expect, it } from 'vitest';
import { fitCurve, fitFromJSON } from '$lib/numerics/fits';
import { kinkNear, kinkSentence, sketchCurve } from '$lib/replay/curveSketch';
import { expectClose } from '../../reference/tolerance';

// INVENTED coarse table with a maximum between knots (the demo's shape)
const X = [0.1, 0.3, 0.5, 0.7, 0.9, 1.1, 1.3, 1.5];
const Y = [0.3, 0.58, 0.74, 0.83, 0.86, 0.8, 0.62, 0.3];
const secant = (i: number) => (Y[i + 1] - Y[i]) / (X[i + 1] - X[i]);

describe('curve sketch', () => {
	it('linear: every interior knot is a kink with the secants as its one-sided slopes, drawn as a vertical jump in f′', () => {
		const fit = fitCurve('linear', X, Y);
		const s = sketchCurve(fit, [0.1, 1.5], 50);
		expect(s.knots.map((k) => k.x)).toEqual(X.slice(1, -1));
		for (const k of s.knots) {
			expect(k.kink).toBe(true);
			expectClose(k.left, secant(k.knot - 1), 1e-12, `left slope at ${k.x}`);
			expectClose(k.right, secant(k.knot), 1e-12, `right slope at ${k.x}`);
			// two samples at the knot's x: the left limit, then the right
			const at = s.points.filter((p) => p.x === k.x);
			expect(at.length).toBeGreaterThanOrEqual(2);
			expectClose(at[0].df, secant(k.knot - 1), 1e-12);
			expectClose(at[1].df, secant(k.knot), 1e-12);
			expectClose(at[0].f, at[1].f, 1e-12, 'f is continuous');
		}
		// samples run left to right over the bounds and agree with the fit
		for (let i = 1; i < s.points.length; i++) expect(s.points[i].x).toBeGreaterThanOrEqual(s.points[i - 1].x);
		expect(s.points[0].x).toBe(0.1);
		expect(s.points.at(-1)!.x).toBe(1.5);
		for (const p of s.points.filter((_, i) => i % 7 === 3)) expectClose(p.f, fit.evaluate(p.x).f, 1e-14);
	});

	it('Akima and PCHIP: no kink, but f″ jumps at knots', () => {
		for (const method of ['akima', 'pchip'] as const) {
			const s = sketchCurve(fitCurve(method, X, Y), [0.1, 1.5]);
			expect(s.knots.filter((k) => k.kink), method).toEqual([]);
			expect(s.knots.some((k) => k.curvatureJump), method).toBe(true);
			for (const k of s.knots) expectClose(k.left, k.right, 1e-9, `${method} f′ continuous at ${k.x}`);
		}
	});

	it('works the same on a fit read back from its fit file (what the browser gets)', () => {
		const fit = fitCurve('linear', X, Y);
		const again = fitFromJSON(JSON.parse(JSON.stringify(fit.toJSON())));
		expect(sketchCurve(again, [0.2, 1.2])).toEqual(sketchCurve(fit, [0.2, 1.2]));
	});

	it('bounds narrower than the data keep only their knots; bounds outside a refusing fit are refused', () => {
		const s = sketchCurve(fitCurve('linear', X, Y), [0.4, 1.0]);
		expect(s.knots.map((k) => k.x)).toEqual([0.5, 0.7, 0.9]);
		expect(s.domain).toEqual([0.4, 1.0]);
		expect(() => sketchCurve(fitCurve('linear', X, Y), [2, 3])).toThrow(/do not overlap/);
	});

	it('finds the kink a run stalled at and says why, with the slopes’ signs', () => {
		const s = sketchCurve(fitCurve('linear', X, Y), [0.1, 1.5]);
		const k = kinkNear(s, 0.9 + 1e-9, 1e-6)!;
		expect(k.x).toBe(0.9);
		expect(k.left).toBeGreaterThan(0);
		expect(k.right).toBeLessThan(0);
		expect(kinkNear(s, 1.0, 1e-6)).toBeNull();
		const fmt = (v: number) => v.toFixed(2);
		const why = kinkSentence(k, 'maximize', fmt, 'J');
		expect(why).toContain('f′ is 0.15 just left of J = 0.90 and -0.30 just right of it');
		expect(why).toMatch(/no gradient is zero/);
		// the same corner read as a minimization is not its optimum: a different reason
		expect(kinkSentence(k, 'minimize', fmt, 'J')).toMatch(/slope changes abruptly/);
		expect(kinkSentence(k, 'solve', fmt, 'J')).toMatch(/overshoot/);
	});
});
