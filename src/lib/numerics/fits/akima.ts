/**
 * Akima interpolation: H. Akima, 1970, "A New Method of Interpolation and
 * Smooth Curve Fitting Based on Local Procedures", J. ACM 17(4):589–602.
 * A local C1 cubic Hermite interpolant whose knot slopes are weighted means of
 * neighbouring secants (see akimaSlopes for the exact rule, ties and ends —
 * identical to SciPy 1.10's Akima1DInterpolator). Unlike that class, our fit
 * states an extrapolation rule instead of returning NaN outside the data.
 */
import { akimaSlopesInto } from './akimaSlopes';
import { PiecewisePolynomial, hermiteInPlace } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function akima(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'akima');
	const d = prepareData(x, y, opts, { label: 'akima', minPoints: 3, minReason: 'the end secants are extended from the two nearest' });
	const buf = new Float64Array(4 * d.x.length);
	akimaSlopesInto(d.x, d.y, false, buf, 4, 1, 3); // slopes in slot 1, secants in slot 3
	const c = hermiteInPlace(d.x, d.y, buf);
	return new PiecewisePolynomial({ method: 'akima', continuity: 'C1', options: opts, knots: d.x, degree: 3, coefficients: c, notes: d.notes });
}
