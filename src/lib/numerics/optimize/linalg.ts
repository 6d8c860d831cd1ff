/**
 * Small dense linear algebra for the optimizers (n is the number of inputs of
 * a fit: 1–6, rarely more), written out so that an iteration allocates little
 * and needs no library.
 */

export const EPS = 2.220446049250313e-16;

export function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
	let s = 0;
	for (let i = 0; i < a.length; i++) s += a[i] * b[i];
	return s;
}

export function norm2(a: ArrayLike<number>): number {
	// scaled to avoid overflow for huge gradients (diverging runs)
	let m = 0;
	for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
	if (m === 0 || !Number.isFinite(m)) return m;
	let s = 0;
	for (let i = 0; i < a.length; i++) {
		const v = a[i] / m;
		s += v * v;
	}
	return m * Math.sqrt(s);
}

export function normInf(a: ArrayLike<number>): number {
	let m = 0;
	for (let i = 0; i < a.length; i++) {
		const v = Math.abs(a[i]);
		if (!(v <= m)) m = v; // NaN propagates
	}
	return m;
}

export function allFinite(a: ArrayLike<number>): boolean {
	for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return false;
	return true;
}

export function identity(n: number, scale = 1): number[][] {
	const m: number[][] = [];
	for (let i = 0; i < n; i++) {
		const row = new Array<number>(n).fill(0);
		row[i] = scale;
		m.push(row);
	}
	return m;
}

/**
 * Solve A x = b by Gaussian elimination with partial pivoting (Golub & Van Loan,
 * Matrix Computations, 4th ed. 2013, Alg. 3.4.1). Returns null when a pivot is
 * below `rcondTol`·max|A| — the matrix is singular to working precision.
 */
export function luSolve(A: number[][], b: ArrayLike<number>, rcondTol = 1e-13): number[] | null {
	const n = b.length;
	const M = A.map((r) => r.slice());
	const x = Array.from(b);
	let scale = 0;
	for (const r of M) for (const v of r) scale = Math.max(scale, Math.abs(v));
	if (!(scale > 0) || !Number.isFinite(scale)) return null;
	for (let k = 0; k < n; k++) {
		let p = k;
		for (let i = k + 1; i < n; i++) if (Math.abs(M[i][k]) > Math.abs(M[p][k])) p = i;
		if (!(Math.abs(M[p][k]) > rcondTol * scale)) return null;
		if (p !== k) {
			[M[p], M[k]] = [M[k], M[p]];
			[x[p], x[k]] = [x[k], x[p]];
		}
		for (let i = k + 1; i < n; i++) {
			const l = M[i][k] / M[k][k];
			if (l === 0) continue;
			for (let j = k; j < n; j++) M[i][j] -= l * M[k][j];
			x[i] -= l * x[k];
		}
	}
	for (let i = n - 1; i >= 0; i--) {
		let s = x[i];
		for (let j = i + 1; j < n; j++) s -= M[i][j] * x[j];
		x[i] = s / M[i][i];
	}
	return allFinite(x) ? x : null;
}

/**
 * Eigenvalues and eigenvectors of a symmetric matrix by the cyclic Jacobi
 * method (Golub & Van Loan 2013, §8.5.2); accurate for the tiny matrices here.
 * vectors[k] is the unit eigenvector of values[k]; values ascend.
 */
export function symmetricEigen(S: number[][]): { values: number[]; vectors: number[][] } {
	const n = S.length;
	const A = S.map((r) => r.slice());
	const V = identity(n);
	for (let sweep = 0; sweep < 60; sweep++) {
		let off = 0;
		let total = 0;
		for (let i = 0; i < n; i++)
			for (let j = 0; j < n; j++) {
				total += A[i][j] * A[i][j];
				if (i !== j) off += A[i][j] * A[i][j];
			}
		if (!(off > 1e-30 * total)) break;
		for (let p = 0; p < n - 1; p++)
			for (let q = p + 1; q < n; q++) {
				const apq = A[p][q];
				if (apq === 0) continue;
				// rotation that annihilates A[p][q] (Golub & Van Loan, Alg. 8.5.1)
				const tau = (A[q][q] - A[p][p]) / (2 * apq);
				const t = Math.sign(tau || 1) / (Math.abs(tau) + Math.sqrt(1 + tau * tau));
				const c = 1 / Math.sqrt(1 + t * t);
				const s = t * c;
				for (let k = 0; k < n; k++) {
					const akp = A[k][p];
					const akq = A[k][q];
					A[k][p] = c * akp - s * akq;
					A[k][q] = s * akp + c * akq;
				}
				for (let k = 0; k < n; k++) {
					const apk = A[p][k];
					const aqk = A[q][k];
					A[p][k] = c * apk - s * aqk;
					A[q][k] = s * apk + c * aqk;
				}
				for (let k = 0; k < n; k++) {
					const vkp = V[k][p];
					const vkq = V[k][q];
					V[k][p] = c * vkp - s * vkq;
					V[k][q] = s * vkp + c * vkq;
				}
			}
	}
	const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => A[a][a] - A[b][b]);
	return {
		values: order.map((i) => A[i][i]),
		vectors: order.map((i) => V.map((row) => row[i]))
	};
}

/**
 * An orthonormal basis of the vectors orthogonal to every row of `normals`
 * (modified Gram–Schmidt, applied twice for orthogonality to working
 * precision). Dependent normals are dropped.
 */
export function nullSpaceBasis(normals: number[][], n: number): number[][] {
	const q: number[][] = [];
	const orthogonalize = (v: number[]) => {
		for (let pass = 0; pass < 2; pass++)
			for (const u of q) {
				const c = dot(u, v);
				for (let i = 0; i < n; i++) v[i] -= c * u[i];
			}
	};
	for (const a of normals) {
		const v = a.slice();
		const before = norm2(v);
		orthogonalize(v);
		const after = norm2(v);
		if (after > 1e-10 * before && after > 0) q.push(v.map((x) => x / after));
	}
	const basis: number[][] = [];
	for (let k = 0; k < n && q.length < n; k++) {
		const v = new Array<number>(n).fill(0);
		v[k] = 1;
		orthogonalize(v);
		const m = norm2(v);
		if (m > 1e-8) {
			const u = v.map((x) => x / m);
			q.push(u);
			basis.push(u);
		}
	}
	return basis;
}
