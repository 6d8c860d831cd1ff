/**
 * Local cubic interpolation: on each interval the cubic through the four
 * surrounding data points x_{i−1} … x_{i+2} (piecewise Lagrange of degree 3;
 * M. Abramowitz, I. A. Stegun, 1964, Handbook of Mathematical Functions,
 * §25.2), shifted inward at the ends. C0 at the knots. See localLagrange.
 */
import { localLagrangeCoefficients } from './localLagrange';
import { PiecewisePolynomial } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function localCubic(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'local-cubic');
	const d = prepareData(x, y, opts, { label: 'local-cubic', minPoints: 4, minReason: 'each piece is a cubic through four points' });
	const c = localLagrangeCoefficients(d.x, d.y, 3);
	return new PiecewisePolynomial({ method: 'local-cubic', continuity: 'C0', options: opts, knots: d.x, degree: 3, coefficients: c, notes: d.notes });
}
