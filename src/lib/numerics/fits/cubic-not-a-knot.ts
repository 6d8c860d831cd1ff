/**
 * Not-a-knot cubic spline: the C2 interpolating cubic whose third derivative is
 * also continuous at the second and the next-to-last knot, so the first two and
 * the last two intervals share one cubic (C. de Boor, 1978, A Practical Guide to
 * Splines, chapter IV). Reproduces every cubic exactly. Two points give the
 * line, three the parabola through them.
 */
import { cubicSplineSlopes } from './cubicSplineSlopes';
import { PiecewisePolynomial, hermiteCoefficients } from './PiecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function cubicNotAKnot(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'cubic-not-a-knot');
	const d = prepareData(x, y, opts, { label: 'cubic-not-a-knot', minPoints: 2 });
	const t = cubicSplineSlopes(d.x, d.y, { kind: 'not-a-knot' }, { kind: 'not-a-knot' });
	const c = hermiteCoefficients(d.x, d.y, t);
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
