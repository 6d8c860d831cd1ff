/**
 * A constant offset in y changes f by that constant and f′, f″ not at all.
 * The least-squares polynomial (y centred before its QR solve) and the
 * smoothing spline (slopes from Δy − Δr, not from differences of rounded
 * fitted values) are checked at offsets up to ±1e12 against the fit of the
 * unshifted numbers and against SciPy run live on them (numpy's
 * Polynomial.fit; make_smoothing_spline, which minimises the same functional).
 * The offset table is Y = C + y; the unshifted one is Y − C, exact by
 * Sterbenz's lemma (docs/references.md), so both sides hold the same numbers.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { fitCurve } from '../../../src/lib/numerics/fits';
import { runScipy } from '../../reference/scipy';
import { unevenSmooth } from './fixtures';

const { x, y } = unevenSmooth(30, 4, (t) => Math.sin(t) + 0.1 * Math.cos(7 * t));
const OFFSETS = [1e4, 1e8, 1e10, 1e12, -1e12];
const AT = Array.from({ length: 23 }, (_, i) => x[0] + ((x[x.length - 1] - x[0]) * (i + 0.37)) / 23);
const CASES = [
	{ method: 'polynomial-least-squares' as const, options: { degree: 5 } },
	{ method: 'polynomial-least-squares' as const, options: { degree: 9 } },
	{ method: 'smoothing-spline' as const, options: { lambda: 0.3 } },
	{ method: 'smoothing-spline' as const, options: {} }
];

interface Ref {
	d1: number[];
	d2: number[];
}
let scipy: Record<string, Ref>;

beforeAll(() => {
	const jobs = OFFSETS.map((C) => ({ C, y: y.map((v) => C + v - C) }));
	scipy = runScipy<Record<string, Ref>>(
		`from numpy.polynomial import Polynomial
from scipy.interpolate import make_smoothing_spline
x = np.array(data['x']); at = np.array(data['at'])
out = {}
for job in data['jobs']:
    yy = np.array(job['y'])
    for deg in (5, 9):
        p = Polynomial.fit(x, yy, deg)
        out[f"{job['C']}:poly{deg}"] = {'d1': p.deriv(1)(at), 'd2': p.deriv(2)(at)}
    s = make_smoothing_spline(x, yy, lam=0.3)
    out[f"{job['C']}:smooth"] = {'d1': s.derivative(1)(at), 'd2': s.derivative(2)(at)}`,
		{ x, at: AT, jobs }
	);
});

const maxAbs = (v: number[]) => v.reduce((m, u) => Math.max(m, Math.abs(u)), 0);

describe('offset in y: f′ and f″ unchanged (least-squares polynomial, smoothing spline)', () => {
	for (const { method, options } of CASES) {
		for (const C of OFFSETS) {
			it(`${method} ${JSON.stringify(options)} at C = ${C}: same f′, f″ as the unshifted fit; f shifted by C`, () => {
				const Y = y.map((v) => C + v);
				const ref = fitCurve(method, x, Y.map((v) => v - C), options);
				const fit = fitCurve(method, x, Y, options);
				const d1 = AT.map((v) => ref.evaluate(v).df);
				const d2 = AT.map((v) => ref.evaluate(v).d2f);
				const s1 = maxAbs(d1);
				const s2 = maxAbs(d2);
				AT.forEach((v, i) => {
					const e = fit.evaluate(v);
					// f′ to 1e-9 of its size: before the fix, 1e-3 at 1e12 (common practice, no source)
					expect(Math.abs(e.df - d1[i]), `f′(${v})`).toBeLessThanOrEqual(1e-9 * s1);
					expect(Math.abs(e.d2f - d2[i]), `f″(${v})`).toBeLessThanOrEqual(1e-8 * s2);
					// f itself carries the offset's rounding: a few ulps of C
					expect(Math.abs(e.f - C - ref.evaluate(v).f), `f(${v})`).toBeLessThanOrEqual(64 * 2.2e-16 * Math.abs(C) + 1e-9);
				});
			});
		}
	}

	for (const C of OFFSETS) {
		it(`SciPy (numpy Polynomial.fit, make_smoothing_spline λ = 0.3) on the unshifted numbers agrees with our fit at C = ${C}`, () => {
			const Y = y.map((v) => C + v);
			const pairs: [string, ReturnType<typeof fitCurve>][] = [
				['poly5', fitCurve('polynomial-least-squares', x, Y, { degree: 5 })],
				['poly9', fitCurve('polynomial-least-squares', x, Y, { degree: 9 })],
				['smooth', fitCurve('smoothing-spline', x, Y, { lambda: 0.3 })]
			];
			for (const [key, fit] of pairs) {
				const r = scipy[`${C}:${key}`];
				const s1 = maxAbs(r.d1);
				const s2 = maxAbs(r.d2);
				AT.forEach((v, i) => {
					const e = fit.evaluate(v);
					expect(Math.abs(e.df - r.d1[i]), `${key} f′(${v})`).toBeLessThanOrEqual(1e-8 * s1);
					expect(Math.abs(e.d2f - r.d2[i]), `${key} f″(${v})`).toBeLessThanOrEqual(1e-7 * s2);
				});
			}
		});
	}
});
