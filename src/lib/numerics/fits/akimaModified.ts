/**
 * Modified Akima ("makima") interpolation: C. Moler, 2019, "Makima Piecewise
 * Cubic Interpolation", Cleve's Corner (blog), modifying H. Akima, 1970, J. ACM
 * 17(4):589–602. Akima's weights get the extra terms |m_{i+1} + m_i|/2 and
 * |m_{i−1} + m_{i−2}|/2 (see akimaSlopes): flat runs stay flat without ripples
 * beside them, and the slope is 0 where all four neighbouring secants are 0.
 */
import { akimaSlopesInto } from './akimaSlopes';
import { PiecewisePolynomial, hermiteInPlace } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function akimaModified(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'akima-modified');
	const d = prepareData(x, y, opts, {
		label: 'akima-modified',
		minPoints: 3,
		minReason: 'the end secants are extended from the two nearest'
	});
	const buf = new Float64Array(4 * d.x.length);
	akimaSlopesInto(d.x, d.y, true, buf, 4, 1, 3); // slopes in slot 1, secants in slot 3
	const c = hermiteInPlace(d.x, d.y, buf);
	return new PiecewisePolynomial({ method: 'akima-modified', continuity: 'C1', options: opts, knots: d.x, degree: 3, coefficients: c, notes: d.notes });
}
