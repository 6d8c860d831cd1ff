/**
 * Natural cubic spline: the C2 piecewise cubic through the data with f″ = 0 at
 * both ends — among all C2 interpolants it minimises ∫f″² (J. C. Holladay,
 * 1957, "A smoothest curve approximation", Math. Tables Aids Comput. 11:233–243).
 * Built in the slope formulation of C. de Boor, 1978, A Practical Guide to
 * Splines, chapter IV; see cubicSplineSlopes.
 */
import { cubicSplineSlopesInto } from './cubicSplineSlopes';
import { PiecewisePolynomial, hermiteInPlace } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function cubicNatural(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'cubic-natural');
	const d = prepareData(x, y, opts, { label: 'cubic-natural', minPoints: 2 });
	// Slopes into slot 1 of each piece, sweep scratch in slot 2; the Hermite pass then fills the rest.
	const buf = new Float64Array(4 * d.x.length);
	cubicSplineSlopesInto(d.x, d.y, { kind: 'natural' }, { kind: 'natural' }, buf, 4, 1, 2);
	const c = hermiteInPlace(d.x, d.y, buf);
	return new PiecewisePolynomial({ method: 'cubic-natural', continuity: 'C2', options: opts, knots: d.x, degree: 3, coefficients: c, notes: d.notes });
}
