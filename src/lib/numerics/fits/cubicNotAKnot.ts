/**
 * Not-a-knot cubic spline: the C2 interpolating cubic whose third derivative is
 * also continuous at the second and the next-to-last knot, so the first two and
 * the last two intervals share one cubic (C. de Boor, 1978, A Practical Guide to
 * Splines, chapter IV). Reproduces every cubic exactly. Two points give the
 * line, three the parabola through them.
 */
import { cubicSplineSlopesInto } from './cubicSplineSlopes';
import { PiecewisePolynomial, hermiteInPlace } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function cubicNotAKnot(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'cubic-not-a-knot');
	const d = prepareData(x, y, opts, { label: 'cubic-not-a-knot', minPoints: 2 });
	// Slopes into slot 1 of each piece, sweep scratch in slot 2; the Hermite pass then fills the rest.
	const buf = new Float64Array(4 * d.x.length);
	cubicSplineSlopesInto(d.x, d.y, { kind: 'not-a-knot' }, { kind: 'not-a-knot' }, buf, 4, 1, 2);
	const c = hermiteInPlace(d.x, d.y, buf);
	if (d.x.length === 2) d.notes.push('two points: not-a-knot gives the straight line');
	if (d.x.length === 3) d.notes.push('three points: not-a-knot gives the parabola through them');
	return new PiecewisePolynomial({
		method: 'cubic-not-a-knot',
		continuity: 'C2',
		options: opts,
		knots: d.x,
		degree: 3,
		coefficients: c,
		notes: d.notes
	});
}
