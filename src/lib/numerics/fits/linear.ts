/**
 * Piecewise linear interpolation ("broken line"): C. de Boor, 1978,
 * A Practical Guide to Splines, Springer, chapter II. C0: the slope jumps at
 * every interior data point — the kinks this product exists to expose.
 */
import { PiecewisePolynomial } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function linear(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'linear');
	const d = prepareData(x, y, opts, { label: 'linear', minPoints: 2 });
	const xs = d.x;
	const ys = d.y;
	const m = xs.length - 1;
	const c = new Float64Array(2 * m);
	for (let i = 0, o = 0; i < m; i++, o += 2) {
		c[o] = ys[i];
		c[o + 1] = (ys[i + 1] - ys[i]) / (xs[i + 1] - xs[i]);
	}
	return new PiecewisePolynomial({ method: 'linear', continuity: 'C0', options: opts, knots: xs, degree: 1, coefficients: c, notes: d.notes });
}
