/**
 * Clamped (complete) cubic spline: the C2 interpolating cubic with given f′ at
 * both ends (C. de Boor, 1978, A Practical Guide to Splines, chapter IV; the
 * end slopes come from options.slopes). With exact end slopes it reproduces
 * every cubic.
 */
import { cubicSplineSlopesInto } from './cubicSplineSlopes';
import { FitError } from './fitError';
import { PiecewisePolynomial, hermiteInPlace } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function cubicClamped(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'cubic-clamped');
	const sl = opts.slopes;
	if (!sl || sl.length !== 2 || !Number.isFinite(sl[0]) || !Number.isFinite(sl[1])) {
		throw new FitError('missing-slopes', 'cubic-clamped needs options.slopes = [f′ at the first x, f′ at the last x] (two finite numbers)');
	}
	const d = prepareData(x, y, opts, { label: 'cubic-clamped', minPoints: 2 });
	// Slopes into slot 1 of each piece, sweep scratch in slot 2; the Hermite pass then fills the rest.
	const buf = new Float64Array(4 * d.x.length);
	cubicSplineSlopesInto(d.x, d.y, { kind: 'clamped', slope: sl[0] }, { kind: 'clamped', slope: sl[1] }, buf, 4, 1, 2);
	const c = hermiteInPlace(d.x, d.y, buf);
	return new PiecewisePolynomial({ method: 'cubic-clamped', continuity: 'C2', options: opts, knots: d.x, degree: 3, coefficients: c, notes: d.notes });
}
