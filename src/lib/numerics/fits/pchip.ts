/**
 * PCHIP — piecewise cubic Hermite interpolation that keeps monotone data
 * monotone.
 *
 * F. N. Fritsch, R. E. Carlson, 1980, "Monotone Piecewise Cubic Interpolation",
 * SIAM J. Numer. Anal. 17(2):238–246: a cubic Hermite piece is monotone when its
 * end slopes, divided by the secant, lie in a region that contains the square
 * [0, 3]²; slopes are zero wherever the data turn (a local extremum or a flat
 * secant).
 * F. N. Fritsch, J. Butland, 1984, "A method for constructing local monotone
 * piecewise cubic interpolants", SIAM J. Sci. Stat. Comput. 5(2):300–304: the
 * interior slope is the weighted harmonic mean of the two secants,
 *     1/t_i = (w1/m_{i−1} + w2/m_i)/(w1 + w2),  w1 = 2h_i + h_{i−1},  w2 = h_i + 2h_{i−1},
 * which always lies in that region (no later clipping needed), and t_i = 0 when
 * the secants differ in sign or either is zero.
 * Ends: the one-sided three-point estimate ((2h0 + h1)m0 − h0·m1)/(h0 + h1), set
 * to 0 if its sign differs from m0, and to 3m0 if the secants change sign and
 * it exceeds 3|m0| — the rule of SciPy's PchipInterpolator, which this matches
 * operation for operation.
 */
import { PiecewisePolynomial, hermiteInPlace } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

/** PCHIP knot slopes as a new array (see pchipSlopesInto). */
export function pchipSlopes(x: Float64Array, y: ArrayLike<number>): Float64Array {
	const t = new Float64Array(x.length);
	pchipSlopesInto(x, y, t, 1, 0);
	return t;
}

/** Writes t_i to out[offset + stride·i] for the values y[yo + i]; one pass with the secants carried along. */
export function pchipSlopesInto(x: Float64Array, y: ArrayLike<number>, out: Float64Array, stride: number, offset: number, yo = 0): void {
	const n = x.length;
	if (n === 2) {
		out[offset] = out[offset + stride] = (y[yo + 1] - y[yo]) / (x[1] - x[0]);
		return;
	}
	let hl = x[1] - x[0];
	let ml = (y[yo + 1] - y[yo]) / hl;
	const h0 = hl;
	const m0 = ml;
	let hr = 0;
	let mr = 0;
	let hPrev = 0;
	let mPrev = 0;
	for (let i = 1; i < n - 1; i++) {
		hr = x[i + 1] - x[i];
		mr = (y[yo + i + 1] - y[yo + i]) / hr;
		let t = 0;
		if (!(Math.sign(ml) !== Math.sign(mr) || ml === 0 || mr === 0)) {
			const w1 = 2 * hr + hl;
			const w2 = hr + 2 * hl;
			t = 1.0 / ((w1 / ml + w2 / mr) / (w1 + w2));
		}
		out[offset + stride * i] = t;
		hPrev = hl;
		mPrev = ml;
		hl = hr;
		ml = mr;
	}
	out[offset] = endSlope(h0, x[2] - x[1], m0, (y[yo + 2] - y[yo + 1]) / (x[2] - x[1]));
	// hr, mr: the last interval; hPrev, mPrev: the one before it.
	out[offset + stride * (n - 1)] = endSlope(hr, hPrev, mr, mPrev);
}

/**
 * pchipSlopesInto for `count` lines side by side, in place in one array: line
 * c's value i is data[base + c·lineStride + i·iStride + from], its slope goes to
 * the same place with `to`. The same operations as the one-line pass, so the
 * same bits; a step of the sweep takes every line once (the grid fits' lines).
 */
export function pchipSlopesAcross(x: Float64Array, data: Float64Array, base: number, iStride: number, lineStride: number, count: number, from: number, to: number): void {
	const n = x.length;
	const end = base + count * lineStride;
	if (n === 2) {
		const h = x[1] - x[0];
		for (let q = base; q < end; q += lineStride) data[q + to] = data[q + iStride + to] = (data[q + iStride + from] - data[q + from]) / h;
		return;
	}
	for (let i = 1; i < n - 1; i++) {
		const hl = x[i] - x[i - 1];
		const hr = x[i + 1] - x[i];
		const w1 = 2 * hr + hl;
		const w2 = hr + 2 * hl;
		const sw = w1 + w2;
		const row = base + i * iStride;
		for (let q = row, stop = end + i * iStride; q < stop; q += lineStride) {
			const yc = data[q + from];
			const ml = (yc - data[q - iStride + from]) / hl;
			const mr = (data[q + iStride + from] - yc) / hr;
			let t = 0;
			if (!(Math.sign(ml) !== Math.sign(mr) || ml === 0 || mr === 0)) t = 1.0 / ((w1 / ml + w2 / mr) / sw);
			data[q + to] = t;
		}
	}
	const h0 = x[1] - x[0];
	const h1 = x[2] - x[1];
	const hr = x[n - 1] - x[n - 2];
	const hPrev = x[n - 2] - x[n - 3];
	const last = (n - 1) * iStride;
	for (let q = base; q < end; q += lineStride) {
		const y0 = data[q + from];
		const y1 = data[q + iStride + from];
		const y2 = data[q + 2 * iStride + from];
		data[q + to] = endSlope(h0, x[2] - x[1], (y1 - y0) / h0, (y2 - y1) / h1);
		const ya = data[q + last - 2 * iStride + from];
		const yb = data[q + last - iStride + from];
		const yc = data[q + last + from];
		data[q + last + to] = endSlope(hr, hPrev, (yc - yb) / hr, (yb - ya) / hPrev);
	}
}

function endSlope(h0: number, h1: number, m0: number, m1: number): number {
	const d = ((2 * h0 + h1) * m0 - h0 * m1) / (h0 + h1);
	if (Math.sign(d) !== Math.sign(m0)) return 0;
	if (Math.sign(m0) !== Math.sign(m1) && Math.abs(d) > 3 * Math.abs(m0)) return 3 * m0;
	return d;
}

export function pchip(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'pchip');
	const d = prepareData(x, y, opts, { label: 'pchip', minPoints: 2 });
	const buf = new Float64Array(4 * d.x.length);
	pchipSlopesInto(d.x, d.y, buf, 4, 1);
	const c = hermiteInPlace(d.x, d.y, buf);
	return new PiecewisePolynomial({ method: 'pchip', continuity: 'C1', options: opts, knots: d.x, degree: 3, coefficients: c, notes: d.notes });
}
