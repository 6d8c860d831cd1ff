/**
 * Knot slopes of Akima's local method and of its modified ("makima") variant.
 *
 * H. Akima, 1970, "A New Method of Interpolation and Smooth Curve Fitting Based
 * on Local Procedures", J. ACM 17(4):589–602. With secants m_i on
 * [x_i, x_{i+1}], the slope at knot i is
 *     t_i = (w1·m_{i−1} + w2·m_i) / (w1 + w2),
 *     w1 = |m_{i+1} − m_i|,  w2 = |m_{i−1} − m_{i−2}|,
 * and the secants are extended past each end by m_{−1} = 2m_0 − m_1,
 * m_{−2} = 2m_{−1} − m_0 (likewise on the right).
 *
 * Ties follow SciPy 1.10's Akima1DInterpolator exactly: where w1 + w2 is at most
 * 1e-9 times its largest value over all knots, the weights are undefined and
 * the slope is 0.5·(m_{i+1} + m_{i−2}) — the mean of the two neighbouring
 * secants when the weights are truly zero (m_{i+1} = m_i, m_{i−1} = m_{i−2}).
 * The relative threshold makes the rule independent of the data's units.
 *
 * Modified Akima: C. Moler, 2019, "Makima Piecewise Cubic Interpolation",
 * Cleve's Corner (blog). Same form with
 *     w1 = |m_{i+1} − m_i| + |m_{i+1} + m_i|/2,  w2 = |m_{i−1} − m_{i−2}| + |m_{i−1} + m_{i−2}|/2;
 * the added terms keep a flat run flat with no ripple beside it and make the
 * weights vanish only when all four secants are zero, where t_i = 0.
 */

/** Akima (or modified Akima) knot slopes as a new array (see akimaSlopesInto). */
import { stridedValues } from '../math';
export function akimaSlopes(x: Float64Array, y: ArrayLike<number>, modified: boolean): Float64Array {
	return stridedValues(x.length, (buf) => akimaSlopesInto(x, y, modified, buf, 2, 0, 1));
}

/**
 * Writes t_i to buf[offset + stride·i], using buf[scratch + stride·k] to hold
 * the secant m_k (k = 0 … n − 2): the cubic builders pass their coefficient
 * buffer (slopes in slot 1, secants in slot 3 of each piece), so the slopes
 * cost no memory of their own. The two extended secants at each end are kept
 * apart. Original Akima makes two passes over the secants because its tie
 * threshold is relative to the largest weight sum over all knots. The values
 * are y[yo + i] (the grid fits pass one line of a larger plane).
 */
export function akimaSlopesInto(
	x: Float64Array,
	y: ArrayLike<number>,
	modified: boolean,
	buf: Float64Array,
	stride: number,
	offset: number,
	scratch: number,
	yo = 0
): void {
	const n = x.length;
	let xp = x[0];
	let yp = y[yo];
	for (let k = 0, o = scratch; k < n - 1; k++, o += stride) {
		const xn = x[k + 1];
		const yn = y[yo + k + 1];
		buf[o] = (yn - yp) / (xn - xp);
		xp = xn;
		yp = yn;
	}
	// Extended secants m_{−2}, m_{−1} and m_{n−1}, m_n.
	const m0 = buf[scratch];
	const mm1 = 2 * m0 - buf[scratch + stride];
	const mm2 = 2 * mm1 - m0;
	const mLast = buf[scratch + stride * (n - 2)];
	const mp1 = 2 * mLast - buf[scratch + stride * (n - 3)];
	const mp2 = 2 * mp1 - mLast;
	// m_{i+1} at the window's leading edge is buf[q] while i + 1 ≤ n − 2, then mp1, then mp2
	// (written out, not as a closure: this is the inner loop of every grid line)

	let cut = 0;
	if (!modified) {
		let big = -Infinity;
		let a = mm2;
		let b = mm1;
		let c = m0;
		for (let i = 0, q = scratch + stride; i < n; i++, q += stride) {
			const d = i + 1 <= n - 2 ? buf[q] : i + 1 === n - 1 ? mp1 : mp2;
			const f12 = Math.abs(d - c) + Math.abs(b - a);
			if (f12 > big) big = f12;
			a = b;
			b = c;
			c = d;
		}
		cut = 1e-9 * big;
	}
	let a = mm2; // m_{i−2}
	let b = mm1; // m_{i−1}
	let c = m0; // m_i
	for (let i = 0, q = scratch + stride; i < n; i++, q += stride) {
		const d = i + 1 <= n - 2 ? buf[q] : i + 1 === n - 1 ? mp1 : mp2; // m_{i+1}
		let t: number;
		if (modified) {
			const w1 = Math.abs(d - c) + 0.5 * Math.abs(d + c);
			const w2 = Math.abs(b - a) + 0.5 * Math.abs(b + a);
			const sw = w1 + w2;
			t = sw === 0 ? 0 : (w1 * b + w2 * c) / sw;
		} else {
			const f1 = Math.abs(d - c);
			const f2 = Math.abs(b - a);
			const f12 = f1 + f2;
			t = f12 > cut ? (f1 * b + f2 * c) / f12 : 0.5 * (d + a);
		}
		buf[offset + stride * i] = t;
		a = b;
		b = c;
		c = d;
	}
}

/**
 * Original Akima's slopes (akimaSlopesInto with modified = false) for `count`
 * lines side by side, in place in one array: line c's value i is
 * data[base + c·lineStride + i·iStride + from], its slope goes to the same
 * place with `to`. The extended secants m_{−2} … m_n of every line go to
 * `work` (secant r − 2 of line c at work[r·count + c]) and their differences
 * W_r = |m_{r−1} − m_{r−2}| after them (W_r at work[(n + 3 + r)·count + c]), so
 * `work` needs at least (2n + 5)·count numbers; each line keeps its own tie
 * threshold (in `cuts`). Slope i takes f1 = |m_{i+1} − m_i| = W_{i+2} and
 * f2 = |m_{i−1} − m_{i−2}| = W_i: the same numbers, added in the same order,
 * as the one-line pass, so the same bits. Needs three knots or more.
 */
export function akimaSlopesAcross(
	x: Float64Array,
	data: Float64Array,
	base: number,
	iStride: number,
	lineStride: number,
	count: number,
	from: number,
	to: number,
	work: Float64Array,
	cuts: Float64Array
): void {
	const n = x.length;
	const wBase = (n + 3) * count;
	cuts.fill(-Infinity, 0, count);
	// one pass: secant k (row k + 2), then W_{k+1} = |m_k − m_{k−1}| and the threshold's f12 = W_{k+1} + W_{k−1};
	// the first two secants come first, since m_{−2}, m_{−1} (rows 0, 1) and so W_0, W_1, W_2 need them
	for (let k = 0; k < 2; k++) {
		const h = x[k + 1] - x[k];
		const row = (k + 2) * count;
		for (let c = 0, q = base + k * iStride + from; c < count; c++, q += lineStride) work[row + c] = (data[q + iStride] - data[q]) / h;
	}
	for (let c = 0; c < count; c++) {
		const m0 = work[2 * count + c];
		const mm1 = 2 * m0 - work[3 * count + c];
		work[count + c] = mm1;
		const mm2 = 2 * mm1 - m0;
		work[c] = mm2;
		const w0 = Math.abs(mm1 - mm2);
		const w2 = Math.abs(work[3 * count + c] - m0);
		work[wBase + c] = w0;
		work[wBase + count + c] = Math.abs(m0 - mm1);
		work[wBase + 2 * count + c] = w2;
		const f12 = w2 + w0;
		if (f12 > cuts[c]) cuts[c] = f12;
	}
	for (let k = 2; k < n - 1; k++) {
		const h = x[k + 1] - x[k];
		const row = (k + 2) * count;
		const wr = wBase + (k + 1) * count;
		for (let c = 0, q = base + k * iStride + from; c < count; c++, q += lineStride) {
			const m = (data[q + iStride] - data[q]) / h;
			work[row + c] = m;
			const w = Math.abs(m - work[row - count + c]);
			work[wr + c] = w;
			const f12 = w + work[wr - 2 * count + c];
			if (f12 > cuts[c]) cuts[c] = f12;
		}
	}
	// m_{n−1}, m_n (rows n + 1, n + 2) and W_r for the rows not reached yet (r = max(3, n) … n + 1)
	for (let c = 0; c < count; c++) {
		const mLast = work[n * count + c];
		const mp1 = 2 * mLast - work[(n - 1) * count + c];
		work[(n + 1) * count + c] = mp1;
		work[(n + 2) * count + c] = 2 * mp1 - mLast;
	}
	for (let r = Math.max(3, n); r <= n + 1; r++) {
		const ra = r * count;
		const wa = wBase + ra;
		for (let c = 0; c < count; c++) {
			const w = Math.abs(work[ra + count + c] - work[ra + c]);
			work[wa + c] = w;
			const f12 = w + work[wa - 2 * count + c];
			if (f12 > cuts[c]) cuts[c] = f12;
		}
	}
	for (let c = 0; c < count; c++) cuts[c] = 1e-9 * cuts[c];
	for (let i = 0; i < n; i++) {
		const ra = i * count;
		const wa = wBase + ra;
		for (let c = 0, q = base + i * iStride + to; c < count; c++, q += lineStride) {
			const f1 = work[wa + 2 * count + c];
			const f2 = work[wa + c];
			const f12 = f1 + f2;
			data[q] = f12 > cuts[c] ? (f1 * work[ra + count + c] + f2 * work[ra + 2 * count + c]) / f12 : 0.5 * (work[ra + 3 * count + c] + work[ra + c]);
		}
	}
}
