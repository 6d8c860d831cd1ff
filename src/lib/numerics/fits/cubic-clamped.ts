/**
 * Clamped (complete) cubic spline: the C2 interpolating cubic with given f′ at
 * both ends (C. de Boor, 1978, A Practical Guide to Splines, chapter IV; the
 * end slopes come from options.slopes). With exact end slopes it reproduces
 * every cubic.
 */
import { cubicSplineSlopes } from './cubicSplineSlopes';
import { FitError } from './FitError';
import { PiecewisePolynomial, hermiteCoefficients } from './PiecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function cubicClamped(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'cubic-clamped');
	const sl = opts.slopes;
	if (!sl || sl.length !== 2 || !Number.isFinite(sl[0]) || !Number.isFinite(sl[1])) {
		throw new FitError('missing-slopes', 'cubic-clamped needs options.slopes = [f′ at the first x, f′ at the last x] (two finite numbers)');
	}
	const d = prepareData(x, y, opts, { label: 'cubic-clamped', minPoints: 2 });
	const t = cubicSplineSlopes(d.x, d.y, { kind: 'clamped', slope: sl[0] }, { kind: 'clamped', slope: sl[1] });
	const c = hermiteCoefficients(d.x, d.y, t);
	return new PiecewisePolynomial({ method: 'cubic-clamped', continuity: 'C2', options: opts, knots: d.x, degree: 3, coefficients: c, notes: d.notes });
}
