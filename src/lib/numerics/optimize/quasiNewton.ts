/**
 * BFGS updates, in place. Both return false — leaving the matrix untouched —
 * when the update would be singular or non-finite; the caller then resets the
 * matrix and counts the reset (never propagates a bad matrix).
 */

/**
 * Inverse-Hessian BFGS update (Nocedal & Wright, Numerical Optimization, 2nd
 * ed. 2006, eq. 6.17): H⁺ = (I − ρsyᵀ) H (I − ρysᵀ) + ρssᵀ, ρ = 1/yᵀs,
 * expanded as H − ρ(s(Hy)ᵀ + (Hy)sᵀ) + (ρ²yᵀHy + ρ)ssᵀ. Requires yᵀs > 0
 * (guaranteed by a Wolfe step, not by an Armijo-only or bound-truncated step).
 */
export function inverseBfgsUpdate(H: number[][], s: number[], y: number[]): boolean {
	const n = s.length;
	let sy = 0;
	let ss = 0;
	let yy = 0;
	for (let i = 0; i < n; i++) {
		sy += s[i] * y[i];
		ss += s[i] * s[i];
		yy += y[i] * y[i];
	}
	// curvature must be positive beyond rounding (N&W §6.1: otherwise skip/reset)
	if (!(sy > 1e-14 * Math.sqrt(ss * yy)) || !Number.isFinite(sy)) return false;
	const rho = 1 / sy;
	const Hy = new Array<number>(n);
	let yHy = 0;
	for (let i = 0; i < n; i++) {
		let v = 0;
		for (let j = 0; j < n; j++) v += H[i][j] * y[j];
		Hy[i] = v;
		yHy += y[i] * v;
	}
	const c = rho * rho * yHy + rho;
	const next: number[][] = [];
	for (let i = 0; i < n; i++) {
		const row = new Array<number>(n);
		for (let j = 0; j < n; j++) {
			const v = H[i][j] - rho * (s[i] * Hy[j] + Hy[i] * s[j]) + c * s[i] * s[j];
			if (!Number.isFinite(v)) return false;
			row[j] = v;
		}
		next.push(row);
	}
	for (let i = 0; i < n; i++) H[i] = next[i];
	return true;
}

/**
 * Damped BFGS update of a Hessian approximation B (M. J. D. Powell, "A fast
 * algorithm for nonlinearly constrained optimization calculations", in
 * Numerical Analysis, Dundee 1977, ed. G. A. Watson, Springer LNM 630,
 * 1978, pp. 144–157; as Procedure 18.2 in Nocedal & Wright 2006):
 *   θ = 1 if sᵀy ≥ 0.2 sᵀBs, else 0.8 sᵀBs / (sᵀBs − sᵀy);  r = θy + (1 − θ)Bs;
 *   B⁺ = B − Bs sᵀB / sᵀBs + r rᵀ / sᵀr.
 * Since sᵀr ≥ 0.2 sᵀBs > 0, B⁺ stays positive definite even when the
 * Lagrangian's curvature along s is negative (constrained problems).
 */
export function dampedBfgsUpdate(B: number[][], s: number[], y: number[]): { ok: boolean; damped: boolean } {
	const n = s.length;
	const Bs = new Array<number>(n);
	let sBs = 0;
	let sy = 0;
	for (let i = 0; i < n; i++) {
		let v = 0;
		for (let j = 0; j < n; j++) v += B[i][j] * s[j];
		Bs[i] = v;
		sBs += s[i] * v;
		sy += s[i] * y[i];
	}
	if (!(sBs > 0) || !Number.isFinite(sBs) || !Number.isFinite(sy)) return { ok: false, damped: false };
	const damped = sy < 0.2 * sBs;
	const theta = damped ? (0.8 * sBs) / (sBs - sy) : 1;
	const r = new Array<number>(n);
	let sr = 0;
	for (let i = 0; i < n; i++) {
		r[i] = theta * y[i] + (1 - theta) * Bs[i];
		sr += s[i] * r[i];
	}
	if (!(sr > 0) || !Number.isFinite(sr)) return { ok: false, damped };
	const next: number[][] = [];
	for (let i = 0; i < n; i++) {
		const row = new Array<number>(n);
		for (let j = 0; j < n; j++) {
			const v = B[i][j] - (Bs[i] * Bs[j]) / sBs + (r[i] * r[j]) / sr;
			if (!Number.isFinite(v)) return { ok: false, damped };
			row[j] = v;
		}
		next.push(row);
	}
	for (let i = 0; i < n; i++) {
		if (!(next[i][i] > 0)) return { ok: false, damped };
		B[i] = next[i];
	}
	return { ok: true, damped };
}
