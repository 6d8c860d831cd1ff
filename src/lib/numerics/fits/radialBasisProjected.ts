/**
 * The saddle system of a radial-basis fit with a polynomial tail,
 *
 *   [K̃  P] [c]   [r]
 *   [Pᵀ 0] [a] = [w],     K̃ = K + λI (n × n), P the tail's n × m columns,
 *
 * solved by projecting out the tail (H. Wendland, 2005, Scattered Data
 * Approximation, ch. 8; M. Benzi, G. H. Golub, J. Liesen, 2005, section 6; see
 * docs/references.md, "Scattered fits: solving the system"). With the
 * Householder QR P = Q[R; 0] and G = QᵀK̃Q in blocks (m, n − m), write
 * c = Q[γ; t]: then Rᵀγ = w, B t = (Qᵀr)₂ − G₂₁γ with B = G₂₂ = ZᵀK̃Z, and
 * R a = (Qᵀr)₁ − G₁₁γ − G₁₂t. When the kernel is conditionally positive
 * definite of an order the tail covers (thin-plate: degree-1 tail;
 * multiquadric −√(1 + r²): degree ≥ 0; Gaussian: any), B is symmetric
 * positive definite and is factored by Cholesky (ml-matrix) — about half the
 * work of an LU of the whole saddle matrix. Otherwise, or when the Cholesky
 * meets a non-positive pivot in rounding, the caller falls back to LU.
 */
import { CholeskyDecomposition, Matrix } from 'ml-matrix';

export interface ProjectedSystem {
	/** solve the saddle system for (r; w); w may be omitted (zero) */
	solve(r: ArrayLike<number>, w?: ArrayLike<number>): Float64Array;
}

/**
 * Factor the projected system, or return null when it is not positive
 * definite in floating point (or the tail's columns are numerically
 * dependent). K holds the rows of K̃ and is overwritten.
 */
export function factorProjected(K: Float64Array[], P: Float64Array[], n: number, m: number): ProjectedSystem | null {
	// Householder reflectors H_k = I − β_k v_k v_kᵀ reducing P to [R; 0] (P is overwritten)
	const vs: Float64Array[] = [];
	const betas: number[] = [];
	let pScale = 0;
	for (let i = 0; i < n; i++) for (let k = 0; k < m; k++) pScale = Math.max(pScale, Math.abs(P[i][k]));
	for (let k = 0; k < m; k++) {
		let ss = 0;
		for (let i = k; i < n; i++) ss += P[i][k] * P[i][k];
		const norm = Math.sqrt(ss);
		// a tail column in the span of the others: the saddle matrix is singular or nearly so; let LU report it
		if (!(norm > 1e-10 * pScale * Math.sqrt(n))) return null;
		const alpha = P[k][k] > 0 ? -norm : norm;
		const v = new Float64Array(n);
		for (let i = k; i < n; i++) v[i] = P[i][k];
		v[k] -= alpha;
		let vv = 0;
		for (let i = k; i < n; i++) vv += v[i] * v[i];
		const beta = 2 / vv;
		for (let j = k; j < m; j++) {
			let t = 0;
			for (let i = k; i < n; i++) t += v[i] * P[i][j];
			t *= beta;
			for (let i = k; i < n; i++) P[i][j] -= t * v[i];
		}
		vs.push(v);
		betas.push(beta);
	}
	// G = Qᵀ K̃ Q, one symmetric two-sided reflection at a time: H K H = K − v yᵀ − y vᵀ, y = βKv − ½β²(vᵀKv)v
	const y = new Float64Array(n);
	for (let k = 0; k < m; k++) {
		const v = vs[k];
		const beta = betas[k];
		for (let i = 0; i < n; i++) {
			const row = K[i];
			let s = 0;
			for (let j = k; j < n; j++) s += row[j] * v[j];
			y[i] = beta * s;
		}
		let vy = 0;
		for (let i = k; i < n; i++) vy += v[i] * y[i];
		const h = 0.5 * beta * vy;
		for (let i = 0; i < n; i++) y[i] -= h * v[i];
		for (let i = 0; i < n; i++) {
			const row = K[i];
			const vi = v[i];
			const yi = y[i];
			for (let j = 0; j < n; j++) row[j] -= vi * y[j] + yi * v[j];
		}
	}
	const nz = n - m;
	const B = new Matrix(nz, nz);
	for (let i = 0; i < nz; i++) {
		const src = K[m + i];
		for (let j = 0; j <= i; j++) {
			// symmetrise exactly (the two-sided update leaves rounding-level asymmetry, and ml-matrix checks symmetry)
			const s = 0.5 * (src[m + j] + K[m + j][m + i]);
			B.set(i, j, s);
			B.set(j, i, s);
		}
	}
	const chol = new CholeskyDecomposition(B);
	if (!chol.isPositiveDefinite()) return null;
	const G1 = K.slice(0, m).map((row) => row.slice());
	const G21 = new Float64Array(nz * m);
	for (let i = 0; i < nz; i++) for (let k = 0; k < m; k++) G21[i * m + k] = K[m + i][k];
	const R = P.slice(0, m).map((row) => row.slice(0, m));
	const applyQt = (x: Float64Array) => {
		for (let k = 0; k < m; k++) {
			const v = vs[k];
			let t = 0;
			for (let i = k; i < n; i++) t += v[i] * x[i];
			t *= betas[k];
			for (let i = k; i < n; i++) x[i] -= t * v[i];
		}
	};
	const applyQ = (x: Float64Array) => {
		for (let k = m - 1; k >= 0; k--) {
			const v = vs[k];
			let t = 0;
			for (let i = k; i < n; i++) t += v[i] * x[i];
			t *= betas[k];
			for (let i = k; i < n; i++) x[i] -= t * v[i];
		}
	};
	return {
		solve(r, w) {
			const q = Float64Array.from(r);
			applyQt(q);
			// Rᵀγ = w (forward substitution; Rᵀ is lower triangular)
			const gamma = new Float64Array(m);
			if (w) {
				for (let k = 0; k < m; k++) {
					let s = w[k];
					for (let l = 0; l < k; l++) s -= R[l][k] * gamma[l];
					gamma[k] = s / R[k][k];
				}
			}
			const rhs = new Matrix(nz, 1);
			for (let i = 0; i < nz; i++) {
				let s = q[m + i];
				for (let k = 0; k < m; k++) s -= G21[i * m + k] * gamma[k];
				rhs.set(i, 0, s);
			}
			const t = chol.solve(rhs);
			const out = new Float64Array(n + m);
			const cz = new Float64Array(n);
			for (let k = 0; k < m; k++) cz[k] = gamma[k];
			for (let i = 0; i < nz; i++) cz[m + i] = t.get(i, 0);
			// R a = (Qᵀr)₁ − G₁₁γ − G₁₂t (back substitution)
			for (let k = m - 1; k >= 0; k--) {
				const g = G1[k];
				let s = q[k];
				for (let j = 0; j < n; j++) s -= g[j] * cz[j];
				for (let l = k + 1; l < m; l++) s -= R[k][l] * out[n + l];
				out[n + k] = s / R[k][k];
			}
			applyQ(cz);
			out.set(cz, 0);
			return out;
		}
	};
}
