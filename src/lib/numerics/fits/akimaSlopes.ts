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

export function akimaSlopes(x: Float64Array, y: Float64Array, modified: boolean): Float64Array {
	const n = x.length;
	// Extended secants: e[k + 2] = m_k for k = −2 … n; two extra on each side.
	const e = new Float64Array(n + 3);
	for (let i = 0; i < n - 1; i++) e[i + 2] = (y[i + 1] - y[i]) / (x[i + 1] - x[i]);
	e[1] = 2 * e[2] - e[3];
	e[0] = 2 * e[1] - e[2];
	e[n + 1] = 2 * e[n] - e[n - 1];
	e[n + 2] = 2 * e[n + 1] - e[n];

	const t = new Float64Array(n);
	if (modified) {
		for (let i = 0; i < n; i++) {
			const mm2 = e[i];
			const mm1 = e[i + 1];
			const m0 = e[i + 2];
			const mp1 = e[i + 3];
			const w1 = Math.abs(mp1 - m0) + 0.5 * Math.abs(mp1 + m0);
			const w2 = Math.abs(mm1 - mm2) + 0.5 * Math.abs(mm1 + mm2);
			const sw = w1 + w2;
			t[i] = sw === 0 ? 0 : (w1 * mm1 + w2 * m0) / sw;
		}
		return t;
	}
	// Original Akima: the tie threshold is relative to the largest w1 + w2, so two passes.
	let big = -Infinity;
	for (let i = 0; i < n; i++) {
		const f12 = Math.abs(e[i + 3] - e[i + 2]) + Math.abs(e[i + 1] - e[i]);
		if (f12 > big) big = f12;
	}
	const cut = 1e-9 * big;
	for (let i = 0; i < n; i++) {
		const f1 = Math.abs(e[i + 3] - e[i + 2]);
		const f2 = Math.abs(e[i + 1] - e[i]);
		const f12 = f1 + f2;
		t[i] = f12 > cut ? (f1 * e[i + 1] + f2 * e[i + 2]) / f12 : 0.5 * (e[i + 3] + e[i]);
	}
	return t;
}
