/**
 * A real table from a published standard: the IAPWS-IF97 saturation line
 * (IAPWS R7-97(2012), §8, Eqs. 30–31, Table 34 coefficients; corroborated).
 * Tabulate p_s(T) on 280–640 K every 20 K, fit it, compare with the equation
 * at the mid-points, and solve for the temperature where the fitted p_s is
 * 1 MPa with Newton's method.
 */
import { describe, expect, it } from 'vitest';
import { expectClose } from '../../reference/tolerance';
import { fitCurve } from '../../../src/lib/numerics/fits';
import type { CurveMethod } from '../../../src/lib/numerics/fits';
import { iapwsPsat, iapwsTsat } from './fixtures';

const T: number[] = [];
for (let t = 280; t <= 640; t += 20) T.push(t);
const P = T.map(iapwsPsat);
const MID = T.slice(0, -1).map((t) => t + 10);

/** Agreement to the published number of significant digits (half a unit in the last one). */
function expectDigits(actual: number, published: number, digits: number): void {
	const unit = 10 ** (Math.floor(Math.log10(Math.abs(published))) - digits + 1);
	expect(Math.abs(actual - published)).toBeLessThanOrEqual(0.5 * unit * (1 + 1e-9));
}

describe('the equations themselves reproduce the verification tables', () => {
	it('Table 35: p_s at 300, 500, 600 K (corroborated, 9 digits)', () => {
		expectDigits(iapwsPsat(300), 0.353658941e-2, 9);
		expectDigits(iapwsPsat(500), 0.263889776e1, 9);
		expectDigits(iapwsPsat(600), 0.123443146e2, 9);
		// computed (docs/references.md), to full precision
		expectClose(iapwsPsat(500), 2.6388977562732219, 1e-15);
	});
	it('Table 36: T_s at 0.1, 1, 10 MPa (corroborated, 9 digits)', () => {
		expectDigits(iapwsTsat(0.1), 0.372755919e3, 9);
		expectDigits(iapwsTsat(1), 0.453035632e3, 9);
		expectDigits(iapwsTsat(10), 0.584149488e3, 9);
		// computed (docs/references.md), to full precision
		expectClose(iapwsTsat(1), 453.03563239146661, 1e-14);
	});
	it('extras (computed): triple point, critical point, round trip', () => {
		expectClose(iapwsPsat(273.16), 6.1165700001066534e-4, 1e-13);
		expectClose(iapwsPsat(647.096), 22.064000000320569, 1e-14);
		expect(Math.abs(iapwsTsat(iapwsPsat(500)) - 500)).toBeLessThan(1e-11);
	});
});

function midErrors(method: CurveMethod): number[] {
	const fit = fitCurve(method, T, P);
	return MID.map((t) => Math.abs(fit.evaluate(t).f - iapwsPsat(t)));
}

describe('smooth fits beat linear interpolation at the mid-points', () => {
	const linear = midErrors('linear');
	const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];
	// [method, smallest acceptable median gain over linear]
	const cases: [CurveMethod, number][] = [
		['cubic-not-a-knot', 300],
		['cubic-natural', 100],
		['pchip', 100],
		['local-cubic', 100],
		['akima', 30],
		['akima-modified', 30]
	];
	it.each(cases)('%s: median gain ≥ %i× and better at every mid-point', (method, gain) => {
		const e = midErrors(method);
		const ratios = linear.map((l, i) => l / e[i]);
		expect(median(ratios)).toBeGreaterThanOrEqual(gain);
		expect(Math.min(...ratios)).toBeGreaterThan(2);
	});
	it('two orders of magnitude or more in the interior for the C2 splines', () => {
		const nak = midErrors('cubic-not-a-knot');
		// mid-points 330 … 550 K: away from both ends, where end conditions matter least
		for (let i = 2; i <= 13; i++) expect(linear[i] / nak[i]).toBeGreaterThanOrEqual(100);
	});
});

describe('Newton on the fit: the temperature where p_s = 1 MPa', () => {
	// Table 36 (corroborated): T_s(1 MPa) = 453.035632 K.
	const TS = 453.035632;
	function newton(method: CurveMethod): number {
		const fit = fitCurve(method, T, P);
		let t = 440;
		for (let k = 0; k < 50; k++) {
			const j = fit.evaluate(t);
			const step = (j.f - 1) / j.df;
			t -= step;
			if (Math.abs(step) < 1e-12 * t) break;
		}
		expectClose(fit.evaluate(t).f, 1, 1e-13, `${method} residual`);
		return t;
	}
	it.each(['cubic-not-a-knot', 'cubic-natural', 'pchip', 'akima', 'polynomial-global', 'linear'] as CurveMethod[])(
		'%s lands on 453.035632 K within its own error',
		(method) => {
			const t = newton(method);
			// The fit's own error at the solution is |p_s(t) − 1| (the fit says exactly 1 there);
			// divided by the slope of p_s it is the error in temperature that the fit permits.
			const dp = (iapwsPsat(t + 1e-4) - iapwsPsat(t - 1e-4)) / 2e-4;
			const allowed = Math.abs(iapwsPsat(t) - 1) / dp;
			expect(Math.abs(t - TS)).toBeLessThanOrEqual(1.05 * allowed + 1e-6);
		}
	);
	it('the C2 spline is within a millikelvin; linear is most of a kelvin off', () => {
		expect(Math.abs(newton('cubic-not-a-knot') - TS)).toBeLessThan(1e-3);
		expect(Math.abs(newton('linear') - TS)).toBeGreaterThan(0.5);
	});
});
