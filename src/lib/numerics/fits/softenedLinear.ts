/**
 * Softened linear: the linear interpolant with every interior kink rounded
 * by a parabolic fillet, so the fit is C1 and stays within a known distance
 * of the data.
 *
 * Construction (ours; the fillet is the quadratic Bézier curve of
 * P. de Casteljau / P. Bézier, 1959–1966, whose control points are the corner
 * and two points on its legs). At interior knot x_i, with secants m_{i−1}
 * (left) and m_i (right) and width w_i, the corner is replaced on
 * [l, r] = [x_i − w_i/2, x_i + w_i/2] by
 *     q(x) = L(x) + (m_i − m_{i−1})·(x − l)² / (2w_i),
 * where L is the left line. q equals L with L′ at l and the right line with
 * its slope at r, so value and slope are continuous (C1); f″ jumps from 0 to
 * (m_i − m_{i−1})/w_i and back at l and r. q passes (m_i − m_{i−1})·w_i/8 off
 * the data point at x_i (and exactly through the first and the last point).
 *
 * Width: options.width in x units (> 0), capped at each knot by the smaller
 * neighbouring spacing min(h_{i−1}, h_i), so neighbouring fillets never
 * overlap (they at most touch) and never reach past a neighbouring knot.
 * Without a width each kink is rounded over half its smaller neighbouring
 * spacing. Knots of the fit are the fillet ends (plus the two data ends):
 * pieces alternate line, parabola, line, …; a straight piece that shrinks to
 * nothing is left out.
 */
import { FitError } from './fitError';
import { PiecewisePolynomial } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

export function softenedLinear(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'softened-linear');
	const width = opts.width;
	if (width !== undefined && !(typeof width === 'number' && Number.isFinite(width) && width > 0)) {
		throw new FitError('bad-width', `softened-linear: the softening width must be a positive finite number (got ${String(width)})`);
	}
	const d = prepareData(x, y, opts, { label: 'softened-linear', minPoints: 2 });
	const xs = d.x;
	const ys = d.y;
	const n = xs.length;
	const notes = d.notes;
	const sec = new Float64Array(n - 1);
	for (let i = 0; i < n - 1; i++) sec[i] = (ys[i + 1] - ys[i]) / (xs[i + 1] - xs[i]);

	// Fillet ends l_i, r_i for interior knots i = 1..n−2.
	const L = new Float64Array(n);
	const R = new Float64Array(n);
	let capped = 0;
	let worstOffset = 0;
	for (let i = 1; i < n - 1; i++) {
		const room = Math.min(xs[i] - xs[i - 1], xs[i + 1] - xs[i]);
		let wi = width === undefined ? room / 2 : width;
		if (wi > room) {
			wi = room;
			capped++;
		}
		L[i] = xs[i] - wi / 2;
		R[i] = xs[i] + wi / 2;
		worstOffset = Math.max(worstOffset, (Math.abs(sec[i] - sec[i - 1]) * wi) / 8);
	}
	// Where two fillets touch, rounding may put r_i a hair past l_{i+1}: make them meet exactly.
	for (let i = 1; i < n - 2; i++) if (R[i] >= L[i + 1]) R[i] = L[i + 1];

	const knots: number[] = [xs[0]];
	const coef: number[] = [];
	const line = (k: number, from: number) => {
		// The line through (x_k, y_k) with slope sec[k], expanded about `from`.
		coef.push(ys[k] + sec[k] * (from - xs[k]), sec[k], 0);
	};
	if (n === 2) {
		line(0, xs[0]);
		knots.push(xs[1]);
		notes.push('two points: nothing to soften; the fit is the straight line');
	} else {
		line(0, xs[0]);
		for (let i = 1; i < n - 1; i++) {
			// The straight piece (if any) ends at l_i; then the fillet [l_i, r_i].
			if (L[i] > knots[knots.length - 1]) knots.push(L[i]);
			else coef.length -= 3; // zero-length straight piece: drop it
			const l = knots[knots.length - 1];
			const wi = R[i] - l;
			coef.push(ys[i] + sec[i - 1] * (l - xs[i]), sec[i - 1], (sec[i] - sec[i - 1]) / (2 * wi));
			knots.push(R[i]);
			line(i, R[i]);
		}
		if (xs[n - 1] > knots[knots.length - 1]) knots.push(xs[n - 1]);
		else coef.length -= 3;
		if (capped > 0) notes.push(`the width was capped at ${capped} knot${capped > 1 ? 's' : ''} by the neighbouring spacing`);
		if (width === undefined) notes.push('width not given: each kink is rounded over half its smaller neighbouring spacing');
		notes.push(`the fit passes up to ${worstOffset.toPrecision(3)} from the data at interior knots ((slope change)·width/8)`);
	}
	return new PiecewisePolynomial({
		method: 'softened-linear',
		continuity: 'C1',
		options: opts,
		knots: Float64Array.from(knots),
		degree: 2,
		coefficients: Float64Array.from(coef),
		notes
	});
}
