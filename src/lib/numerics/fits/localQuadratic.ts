/**
 * Local quadratic interpolation: on each interval the parabola through the
 * three nearest data points (piecewise Lagrange of degree 2; M. Abramowitz,
 * I. A. Stegun, 1964, Handbook of Mathematical Functions, §25.2). C0 at the
 * knots. Stencil rule and construction: see localLagrange.
 */
import { localLagrangeCoefficients } from './localLagrange';
import { PiecewisePolynomial } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function localQuadratic(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'local-quadratic');
	const d = prepareData(x, y, opts, { label: 'local-quadratic', minPoints: 3, minReason: 'each piece is a parabola through three points' });
	const c = localLagrangeCoefficients(d.x, d.y, 2);
	return new PiecewisePolynomial({ method: 'local-quadratic', continuity: 'C0', options: opts, knots: d.x, degree: 2, coefficients: c, notes: d.notes });
}
