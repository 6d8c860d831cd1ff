/**
 * Piecewise Lagrange interpolation on neighbouring points: on each interval
 * [x_i, x_{i+1}] the polynomial of degree 2 or 3 through a few nearby data
 * points (M. Abramowitz, I. A. Stegun, 1964, Handbook of Mathematical
 * Functions, §25.2, Lagrange interpolation formulas). Each piece passes
 * through both ends of its interval, so the fit is continuous (C0); slopes
 * jump at the knots because neighbouring pieces use different stencils.
 *
 * Stencils. Degree 3: the four points x_{i−1} … x_{i+2}, shifted inward at the
 * two ends. Degree 2: x_i, x_{i+1} and whichever outer neighbour (x_{i−1} or
 * x_{i+2}) lies closer to its end of the interval — the three data points
 * nearest the interval; a tie takes the left one. The first and the last
 * interval take their only neighbour.
 *
 * Each piece is computed in Newton divided-difference form on the nodes
 * z0 = x_i, z1 = x_{i+1}, z2, z3 and expanded about z0 (u = x − z0, e_k = z_k − z0):
 *     p = F0 + F1·u + F2·u(u − e1) + F3·u(u − e1)(u − e2)
 *       = F0 + (F1 − F2·e1 + F3·e1·e2)·u + (F2 − F3·(e1 + e2))·u² + F3·u³,
 * so the power-form coefficient c0 is exactly y_i.
 */

export function localLagrangeCoefficients(x: Float64Array, y: Float64Array, degree: 2 | 3): Float64Array {
	const n = x.length;
	const m = n - 1;
	const stride = degree + 1;
	const c = new Float64Array(stride * m);
	for (let i = 0; i < m; i++) {
		// The extra node(s) besides x_i and x_{i+1}.
		let k2: number;
		let k3 = -1;
		if (degree === 3) {
			if (i === 0) {
				k2 = 2;
				k3 = 3;
			} else if (i === m - 1) {
				k2 = i - 1;
				k3 = i - 2;
			} else {
				k2 = i - 1;
				k3 = i + 2;
			}
		} else if (i === 0) k2 = 2;
		else if (i === m - 1) k2 = i - 1;
		else k2 = x[i] - x[i - 1] <= x[i + 2] - x[i + 1] ? i - 1 : i + 2;

		const z0 = x[i];
		const z1 = x[i + 1];
		const z2 = x[k2];
		const y0 = y[i];
		const y1 = y[i + 1];
		const y2 = y[k2];
		// Divided differences.
		const d01 = (y1 - y0) / (z1 - z0);
		const d12 = (y2 - y1) / (z2 - z1);
		const d012 = (d12 - d01) / (z2 - z0);
		const e1 = z1 - z0;
		const o = stride * i;
		c[o] = y0;
		if (degree === 2) {
			c[o + 1] = d01 - d012 * e1;
			c[o + 2] = d012;
		} else {
			const z3 = x[k3];
			const d23 = (y[k3] - y2) / (z3 - z2);
			const d123 = (d23 - d12) / (z3 - z1);
			const d0123 = (d123 - d012) / (z3 - z0);
			const e2 = z2 - z0;
			c[o + 1] = d01 - d012 * e1 + d0123 * e1 * e2;
			c[o + 2] = d012 - d0123 * (e1 + e2);
			c[o + 3] = d0123;
		}
	}
	return c;
}
