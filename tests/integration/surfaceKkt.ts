// The first-order (KKT) conditions of a study's problem on a surface fit,
// measured in the test from the fit itself — independent of the optimizer's
// own stopping test. For minimize F (F = −f when maximizing) subject to
// c_i(x) ≥ 0 (inequalities written that way), c_i(x) = 0 and lo ≤ x ≤ hi:
//   ∇F = Σ λ_i ∇c_i + Σ μ_k e_k,  λ_i ≥ 0 on inequalities, μ_k ≥ 0 at a lower
//   bound, μ_k ≤ 0 at an upper bound, μ_k = 0 off the bounds,
// with the multipliers of the active set found by least squares (ml-matrix).
// Source: Nocedal & Wright, Numerical Optimization (2006), Theorem 12.1 (the
// KKT conditions), as cited in docs/references.md.
import { Matrix, solve } from 'ml-matrix';
import type { SurfaceFit } from '../../src/lib/numerics/fits/surfaceTypes';

export type Op = '<=' | '>=' | '=';
export type KktConstraint = { fit: SurfaceFit; op: Op; value: number };

export interface KktReport {
	/** ‖∇F − Σλ∇c − Σμe‖∞ over all inputs */
	stationarity: number;
	/** worst constraint violation */
	violation: number;
	/** most negative sign-constrained multiplier (0 when all signs are right) */
	wrongSign: number;
	/** the active set used: constraints by index, inputs at their lower and upper bounds */
	active: { constraints: number[]; lower: number[]; upper: number[] };
}

/** ∇F at x (F = ±f) */
export function gradF(fit: SurfaceFit, x: number[], kind: 'minimize' | 'maximize'): number[] {
	const s = kind === 'maximize' ? -1 : 1;
	return Array.from(fit.evaluate(x).grad, (g) => s * g);
}

export function kkt(fit: SurfaceFit, kind: 'minimize' | 'maximize', bounds: [number, number][], cons: KktConstraint[], x: number[], activeTol = 1e-6): KktReport {
	const n = x.length;
	const g = gradF(fit, x, kind);
	// c_i written as "≥ 0" (or "= 0")
	const cs = cons.map((c) => {
		const j = c.fit.evaluate(x);
		const sign = c.op === '<=' ? -1 : 1;
		return { eq: c.op === '=', value: sign * (j.f - c.value), grad: Array.from(j.grad, (v) => sign * v) };
	});
	const violation = Math.max(0, ...cs.map((c) => (c.eq ? Math.abs(c.value) : Math.max(0, -c.value))));
	const scaleC = cons.map((c) => Math.max(1, Math.abs(c.value)));
	const activeC = cs.flatMap((c, i) => (c.eq || Math.abs(c.value) <= activeTol * scaleC[i] ? [i] : []));
	const width = bounds.map(([lo, hi]) => hi - lo);
	const lower = bounds.flatMap(([lo], k) => (x[k] - lo <= activeTol * width[k] ? [k] : []));
	const upper = bounds.flatMap(([, hi], k) => (hi - x[k] <= activeTol * width[k] ? [k] : []));
	const columns: number[][] = [...activeC.map((i) => cs[i].grad), ...[...lower, ...upper].map((k) => Array.from({ length: n }, (_, r) => (r === k ? 1 : 0)))];
	let mult: number[] = [];
	let residual = g.slice();
	if (columns.length) {
		const A = new Matrix(n, columns.length);
		columns.forEach((col, j) => col.forEach((v, r) => A.set(r, j, v)));
		// least squares (ml-matrix's solve uses QR / SVD for non-square systems)
		mult = solve(A, Matrix.columnVector(g), true).to1DArray();
		residual = g.map((v, r) => v - columns.reduce((s, col, j) => s + col[r] * mult[j], 0));
	}
	let wrongSign = 0;
	activeC.forEach((i, j) => {
		if (!cs[i].eq) wrongSign = Math.min(wrongSign, mult[j]);
	});
	lower.forEach((_, j) => (wrongSign = Math.min(wrongSign, mult[activeC.length + j])));
	upper.forEach((_, j) => (wrongSign = Math.min(wrongSign, -mult[activeC.length + lower.length + j])));
	return { stationarity: Math.max(...residual.map(Math.abs)), violation, wrongSign, active: { constraints: activeC, lower, upper } };
}

/** Rows of a full grid over `axes` (last input fastest), each [...inputs, ...outputs]. */
export function gridRows(axes: number[][], outputs: ((x: number[]) => number)[]): number[][] {
	const rows: number[][] = [];
	const idx = axes.map(() => 0);
	const total = axes.reduce((p, a) => p * a.length, 1);
	for (let node = 0; node < total; node++) {
		const x = idx.map((i, k) => axes[k][i]);
		rows.push([...x, ...outputs.map((f) => f(x))]);
		for (let k = axes.length - 1; k >= 0; k--) {
			if (++idx[k] < axes[k].length) break;
			idx[k] = 0;
		}
	}
	return rows;
}

/** The first `n` points of the Halton sequence (bases 2, 3, 5, …) scaled to `box`: a scatter with no two points alike. */
export function halton(n: number, box: [number, number][]): number[][] {
	const primes = [2, 3, 5, 7, 11, 13];
	const radical = (i: number, b: number) => {
		let f = 1;
		let r = 0;
		for (let k = i; k > 0; k = Math.floor(k / b)) {
			f /= b;
			r += f * (k % b);
		}
		return r;
	};
	return Array.from({ length: n }, (_, i) => box.map(([lo, hi], k) => lo + (hi - lo) * radical(i + 1, primes[k])));
}
