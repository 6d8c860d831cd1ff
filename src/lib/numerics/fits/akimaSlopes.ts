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
export function akimaSlopes(x: Float64Array, y: ArrayLike<number>, modified: boolean): Float64Array {
	const t = new Float64Array(x.length);
	akimaSlopesInto(x, y, modified, t, 1, 0);
	return t;
}

/**
 * Writes t_i to out[offset + stride·i]. The secants are carried along in a
 * window of four (m_{i−2} … m_{i+1}); the two extended secants at each end
 * are computed once. Original Akima makes two passes because its tie
 * threshold is relative to the largest weight sum over all knots.
 */
export function akimaSlopesInto(x: Float64Array, y: ArrayLike<number>, modified: boolean, out: Float64Array, stride: number, offset: number): void {
	const n = x.length;
	const sec = (k: number) => (y[k + 1] - y[k]) / (x[k + 1] - x[k]);
	// Extended secants m_{−2}, m_{−1} and m_{n−1}, m_n.
	const m0 = sec(0);
	const m1 = sec(1);
	const mm1 = 2 * m0 - m1;
	const mm2 = 2 * mm1 - m0;
	const mLast = sec(n - 2);
	const mLast1 = sec(n - 3);
	const mp1 = 2 * mLast - mLast1;
	const mp2 = 2 * mp1 - mLast;
	// Secant m_k for k = −2 … n (only at the window's leading edge).
	const secant = (k: number) => (k <= -2 ? mm2 : k === -1 ? mm1 : k <= n - 2 ? sec(k) : k === n - 1 ? mp1 : mp2);

	let cut = 0;
	if (!modified) {
		let big = -Infinity;
		let a = mm2;
		let b = mm1;
		let c = m0;
		for (let i = 0; i < n; i++) {
			const d = secant(i + 1);
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
	for (let i = 0; i < n; i++) {
		const d = secant(i + 1); // m_{i+1}
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
		out[offset + stride * i] = t;
		a = b;
		b = c;
		c = d;
	}
}
