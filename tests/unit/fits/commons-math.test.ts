/**
 * commons-math-interpolation 2.2.4 (npm; a port of Apache Commons Math) as a
 * second Akima reference.
 *
 * It computes Akima's 1970 knot slopes at knots 2 … n−3, but at the first two
 * and the last two knots it uses three-point derivative estimates instead of
 * Akima's extension of the end secants (docs/references.md, "Cautions"; seen in its
 * source). So only intervals [x_i, x_{i+1}] with both ends among knots
 * 2 … n−3 are comparable. Its tie test is absolute (|w| < ε) with a
 * distance-weighted fallback, while ours follows SciPy (relative 1e-9 and the
 * plain mean), so the data sets below either have no ties or even spacing,
 * where the two fallbacks agree.
 */
import { createAkimaSplineInterpolator } from 'commons-math-interpolation';
import { describe, expect, it } from 'vitest';
import { expectClose } from '../../reference/tolerance';
import { akima } from '../../../src/lib/numerics/fits';
import { AKIMA, RPN14, unevenRough, unevenSmooth } from './fixtures';

function compareInterior(x: number[], y: number[], label: string): number {
	const ours = akima(x, y);
	const theirs = createAkimaSplineInterpolator(x, y);
	const n = x.length;
	let checked = 0;
	for (let i = 2; i + 1 <= n - 3; i++) {
		for (const f of [0, 0.25, 0.5, 0.75, 0.999]) {
			const t = x[i] + f * (x[i + 1] - x[i]);
			expectClose(ours.evaluate(t).f, theirs(t), 1e-12, `${label} x=${t}`);
			checked++;
		}
	}
	return checked;
}

describe('Akima vs commons-math-interpolation (interior intervals only)', () => {
	it("Akima's 1970 data (corroborated) on [2, 8]", () => {
		expect(compareInterior(AKIMA.x, AKIMA.y, 'akima1970')).toBe(6 * 5);
	});
	it('RPN 14 data (corroborated)', () => {
		expect(compareInterior(RPN14.x, RPN14.y, 'rpn14')).toBeGreaterThan(0);
	});
	it('uneven smooth and rough data sets', () => {
		expect(compareInterior(unevenSmooth(30, 7).x, unevenSmooth(30, 7).y, 'smooth')).toBeGreaterThan(100);
		const r = unevenRough(40, 11);
		expect(compareInterior(r.x, r.y, 'rough')).toBeGreaterThan(150);
	});
	it('near the ends the two differ, as documented: 70.625 vs 70.859375 at x = 9.5 (computed)', () => {
		const theirs = createAkimaSplineInterpolator(AKIMA.x, AKIMA.y);
		// computed (docs/references.md): commons-math 70.625, Akima 1970 / SciPy 70.859375
		expectClose(theirs(9.5), 70.625, 1e-14);
		expectClose(akima(AKIMA.x, AKIMA.y).evaluate(9.5).f, 70.859375, 1e-14);
	});
});
