/**
 * The hot loops of radial-basis evaluation: Σ_j c_j g(‖u − u_j‖²) and its
 * gradient Σ_j 2c_j g′(s_j)(u − u_j), one kernel and one dimension per loop so
 * the engine sees straight-line arithmetic (no kernel switch, no inner loop
 * over the inputs for 2 and 3 inputs). Kernels as in radialBasis.ts, of the
 * squared scaled distance s with e2 = ε²:
 *   thin-plate   g = ½e2·s·ln(e2·s),  2g′ = e2·(ln(e2·s) + 1)
 *   multiquadric g = −√(1 + e2·s),    2g′ = −e2/√(1 + e2·s)
 *   Gaussian     g = exp(−e2·s),      2g′ = −2e2·exp(−e2·s)
 * The constant factors (½e2, e2, −2e2) are applied once after the sum.
 * `grad` receives the gradient in scaled inputs without the tail.
 *
 * Thin-plate sums take their logarithms in one batch per call (logTable.ts:
 * pass 1 writes e2·s_j for every centre, logInto turns them into ln(e2·s_j),
 * pass 2 sums): Math.log per centre was about two thirds of the loop's time.
 */
import { LogScratch, logInto } from '../logTable';

export type Kernel = 'thin-plate' | 'multiquadric' | 'gaussian';

/** one scratch for the batch of logarithms (a sum never calls another sum) */
const LOGS = new LogScratch();

/** t[j] = ln(e2·‖u − c_j‖²) for every centre (−∞ at a centre itself) */
function thinPlateLogs(e2: number, c: Float64Array, n: number, d: number, u: Float64Array): Float64Array {
	const t = LOGS.take(n);
	if (d === 3) {
		const u0 = u[0], u1 = u[1], u2 = u[2];
		for (let j = 0, o = 0; j < n; j++, o += 3) {
			const a = u0 - c[o], b = u1 - c[o + 1], z = u2 - c[o + 2];
			t[j] = e2 * (a * a + b * b + z * z);
		}
	} else if (d === 2) {
		const u0 = u[0], u1 = u[1];
		for (let j = 0, o = 0; j < n; j++, o += 2) {
			const a = u0 - c[o], b = u1 - c[o + 1];
			t[j] = e2 * (a * a + b * b);
		}
	} else {
		for (let j = 0, o = 0; j < n; j++, o += d) t[j] = e2 * dist2(u, c, o, d);
	}
	logInto(t, LOGS.bits, t, n);
	return t;
}

/** Σ c_j g(s_j) (value only) at the scaled point u. */
export function kernelSum(kind: Kernel, e2: number, c: Float64Array, coef: Float64Array, d: number, u: Float64Array): number {
	const n = coef.length;
	if (kind === 'thin-plate') {
		const t = thinPlateLogs(e2, c, n, d, u);
		let f = 0;
		if (d === 3) {
			const u0 = u[0], u1 = u[1], u2 = u[2];
			for (let j = 0, o = 0; j < n; j++, o += 3) {
				const a = u0 - c[o], b = u1 - c[o + 1], z = u2 - c[o + 2];
				const s = a * a + b * b + z * z;
				if (s !== 0) f += coef[j] * s * t[j];
			}
		} else if (d === 2) {
			const u0 = u[0], u1 = u[1];
			for (let j = 0, o = 0; j < n; j++, o += 2) {
				const a = u0 - c[o], b = u1 - c[o + 1];
				const s = a * a + b * b;
				if (s !== 0) f += coef[j] * s * t[j];
			}
		} else {
			for (let j = 0, o = 0; j < n; j++, o += d) {
				const s = dist2(u, c, o, d);
				if (s !== 0) f += coef[j] * s * t[j];
			}
		}
		return 0.5 * e2 * f;
	}
	let f = 0;
	if (kind === 'multiquadric') {
		for (let j = 0, o = 0; j < n; j++, o += d) f += coef[j] * Math.sqrt(1 + e2 * dist2(u, c, o, d));
		return -f;
	}
	for (let j = 0, o = 0; j < n; j++, o += d) f += coef[j] * Math.exp(-e2 * dist2(u, c, o, d));
	return f;
}

/** Σ c_j g(s_j) and its gradient in scaled inputs (written to grad[0..d-1]). */
export function kernelSumGradient(kind: Kernel, e2: number, c: Float64Array, coef: Float64Array, d: number, u: Float64Array, grad: Float64Array): number {
	const n = coef.length;
	if (kind === 'thin-plate') {
		const t = thinPlateLogs(e2, c, n, d, u);
		if (d === 3) {
			const u0 = u[0], u1 = u[1], u2 = u[2];
			let f = 0, g0 = 0, g1 = 0, g2 = 0;
			for (let j = 0, o = 0; j < n; j++, o += 3) {
				const a = u0 - c[o], b = u1 - c[o + 1], z = u2 - c[o + 2];
				const s = a * a + b * b + z * z;
				// at a centre the value and the gradient term are 0 (Δ = 0)
				if (s === 0) continue;
				const cj = coef[j];
				const L = t[j];
				f += cj * s * L;
				const w = cj * (L + 1);
				g0 += w * a;
				g1 += w * b;
				g2 += w * z;
			}
			grad[0] = e2 * g0;
			grad[1] = e2 * g1;
			grad[2] = e2 * g2;
			return 0.5 * e2 * f;
		}
		if (d === 2) {
			const u0 = u[0], u1 = u[1];
			let f = 0, g0 = 0, g1 = 0;
			for (let j = 0, o = 0; j < n; j++, o += 2) {
				const a = u0 - c[o], b = u1 - c[o + 1];
				const s = a * a + b * b;
				if (s === 0) continue;
				const cj = coef[j];
				const L = t[j];
				f += cj * s * L;
				const w = cj * (L + 1);
				g0 += w * a;
				g1 += w * b;
			}
			grad[0] = e2 * g0;
			grad[1] = e2 * g1;
			return 0.5 * e2 * f;
		}
		let f = 0;
		grad.fill(0, 0, d);
		for (let j = 0, o = 0; j < n; j++, o += d) {
			const s = dist2(u, c, o, d);
			if (s === 0) continue;
			const cj = coef[j];
			const L = t[j];
			f += cj * s * L;
			const w = cj * (L + 1);
			for (let k = 0; k < d; k++) grad[k] += w * (u[k] - c[o + k]);
		}
		for (let k = 0; k < d; k++) grad[k] *= e2;
		return 0.5 * e2 * f;
	}
	let f = 0;
	grad.fill(0, 0, d);
	if (kind === 'multiquadric') {
		for (let j = 0, o = 0; j < n; j++, o += d) {
			const q = Math.sqrt(1 + e2 * dist2(u, c, o, d));
			const cj = coef[j];
			f += cj * q;
			const w = cj / q;
			for (let k = 0; k < d; k++) grad[k] += w * (u[k] - c[o + k]);
		}
		for (let k = 0; k < d; k++) grad[k] *= -e2;
		return -f;
	}
	for (let j = 0, o = 0; j < n; j++, o += d) {
		const cj = coef[j] * Math.exp(-e2 * dist2(u, c, o, d));
		f += cj;
		for (let k = 0; k < d; k++) grad[k] += cj * (u[k] - c[o + k]);
	}
	for (let k = 0; k < d; k++) grad[k] *= -2 * e2;
	return f;
}

function dist2(u: Float64Array, c: Float64Array, o: number, d: number): number {
	let s = 0;
	for (let k = 0; k < d; k++) {
		const t = u[k] - c[o + k];
		s += t * t;
	}
	return s;
}
