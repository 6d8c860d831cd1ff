/**
 * Penalised smoothing spline: the f minimising
 *     Σ w_i (y_i − f(x_i))² + λ ∫ f″(x)² dx
 * is a natural cubic spline with knots at the data (C. H. Reinsch, 1967,
 * "Smoothing by spline functions", Numer. Math. 10:177–183). We follow the
 * value–second-derivative form of P. J. Green, B. W. Silverman, 1994,
 * "Nonparametric Regression and Generalized Linear Models", Chapman & Hall,
 * §2.3: with g = f(x_i), γ = f″ at the interior knots (γ = 0 at both ends),
 * the tridiagonal Q (n × (n−2)) and R ((n−2) × (n−2)) of that book,
 *     (R + λ QᵀW⁻¹Q) γ = Qᵀy,    g = y − λ W⁻¹Q γ.
 * B = R + λQᵀW⁻¹Q is symmetric positive definite and pentadiagonal, so a
 * banded LDLᵀ factorisation solves it in O(n).
 *
 * The hat matrix A (g = A y) is A = I − λW⁻¹Q B⁻¹ Qᵀ. Its diagonal needs only
 * the five central bands of B⁻¹, which the recursion of M. F. Hutchinson,
 * F. R. de Hoog, 1985, "Smoothing noisy data with spline functions",
 * Numer. Math. 47:99–106, computes from the LDLᵀ factors in O(n). That gives
 * the effective degrees of freedom tr A and the generalised cross-validation
 * score of P. Craven, G. Wahba, 1979, "Smoothing noisy data with spline
 * functions", Numer. Math. 31:377–403:
 *     GCV(λ) = n·Σ w_i(y_i − g_i)² / (n − tr A)².
 * When λ is not given it is the GCV minimiser: a scan over log λ, then a
 * golden-section refinement of the best bracket (GCV can have several local
 * minima; the scan finds the global one on its grid). The scan is centred on
 * λ₀ = tr R / tr(QᵀW⁻¹Q), the λ that balances the two terms, so it does not
 * depend on the units of x and y.
 *
 * SciPy's make_smoothing_spline minimises the same functional (same λ); its
 * GCV uses a bounded search on λ ∈ (0, n) good to about 6e-6 relative.
 * With weights, our GCV uses the weighted residual sum (SciPy's uses the
 * unweighted one); with unit weights the two are the same.
 */
import { FitError } from './fitError';
import { PiecewisePolynomial } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { CurveFitOptions } from './types';

interface Bands {
	n: number;
	h: Float64Array; // spacings, n − 1
	w: Float64Array; // weights, n
	y: Float64Array;
	R0: Float64Array; // diagonal of R, n − 2
	R1: Float64Array; // first super-diagonal of R
	M0: Float64Array; // bands of QᵀW⁻¹Q
	M1: Float64Array;
	M2: Float64Array;
	Qty: Float64Array; // Qᵀy
}

export interface SmoothingSolution {
	lambda: number;
	g: Float64Array; // fitted values at the data
	resid: Float64Array; // y − g, formed directly (not from the rounded g)
	gamma: Float64Array; // f″ at all n knots (0 at the ends)
	leverage: Float64Array; // diag A
	oneMinusLeverage: Float64Array; // 1 − A_ii, formed without cancellation
	edf: number; // tr A
	rss: number; // Σ w (y − g)²
	gcv: number;
}

function setupBands(x: Float64Array, y: Float64Array, w: Float64Array): Bands {
	const n = x.length;
	const N = n - 2;
	const h = new Float64Array(n - 1);
	for (let i = 0; i < n - 1; i++) h[i] = x[i + 1] - x[i];
	const R0 = new Float64Array(N);
	const R1 = new Float64Array(N);
	const M0 = new Float64Array(N);
	const M1 = new Float64Array(N);
	const M2 = new Float64Array(N);
	const Qty = new Float64Array(N);
	// Column j (knot j = J + 1) of Q has 1/h_{j−1}, −1/h_{j−1} − 1/h_j, 1/h_j in rows j−1, j, j+1.
	for (let J = 0; J < N; J++) {
		const j = J + 1;
		const a = 1 / h[j - 1];
		const c = 1 / h[j];
		const b = -a - c;
		R0[J] = (h[j - 1] + h[j]) / 3;
		if (J + 1 < N) R1[J] = h[j] / 6;
		M0[J] = (a * a) / w[j - 1] + (b * b) / w[j] + (c * c) / w[j + 1];
		if (J + 1 < N) {
			const c1 = 1 / h[j + 1];
			const b1 = -c - c1; // Q[j+1][j+1]
			M1[J] = (b * c) / w[j] + (c * b1) / w[j + 1]; // Q[j][j]Q[j][j+1]/w_j + Q[j+1][j]Q[j+1][j+1]/w_{j+1}
		}
		if (J + 2 < N) M2[J] = (c * (1 / h[j + 1])) / w[j + 1];
		// Difference of secants rather than the three-term sum: fewer roundings.
		Qty[J] = (y[j + 1] - y[j]) / h[j] - (y[j] - y[j - 1]) / h[j - 1];
	}
	return { n, h, w, y, R0, R1, M0, M1, M2, Qty };
}

/** Solve at one λ; with `full` also the hat diagonal (needed for GCV and leave-one-out). */
/** Work arrays for one solve; the GCV search reuses one set for all its λ. */
interface Workspace {
	D: Float64Array;
	L1: Float64Array;
	L2: Float64Array;
	z: Float64Array;
	S0: Float64Array;
	S1: Float64Array;
	S2: Float64Array;
	gamma: Float64Array;
	g: Float64Array;
	resid: Float64Array;
	leverage: Float64Array;
	oneMinus: Float64Array;
}

function workspace(n: number): Workspace {
	const N = n - 2;
	const a = (k: number) => new Float64Array(k);
	return { D: a(N), L1: a(N), L2: a(N), z: a(N), S0: a(N), S1: a(N), S2: a(N), gamma: a(n), g: a(n), resid: a(n), leverage: a(n), oneMinus: a(n) };
}

function solveAt(bd: Bands, lambda: number, full: boolean, ws: Workspace = workspace(bd.n)): SmoothingSolution {
	const { n, h, w, y, R0, R1, M0, M1, M2, Qty } = bd;
	const N = n - 2;
	// LDLᵀ of the pentadiagonal B: unit lower factor with sub-diagonals L1, L2.
	const { D, L1, L2 } = ws;
	for (let J = 0; J < N; J++) {
		const b0 = R0[J] + lambda * M0[J];
		const b1 = J + 1 < N ? R1[J] + lambda * M1[J] : 0;
		const b2 = J + 2 < N ? lambda * M2[J] : 0;
		let dJ = b0;
		if (J >= 1) dJ -= L1[J - 1] * L1[J - 1] * D[J - 1];
		if (J >= 2) dJ -= L2[J - 2] * L2[J - 2] * D[J - 2];
		if (!(dJ > 0)) throw new FitError('singular', 'smoothing-spline: the banded system is not positive definite (data too close together?)');
		D[J] = dJ;
		L1[J] = (b1 - (J >= 1 ? L2[J - 1] * D[J - 1] * L1[J - 1] : 0)) / dJ;
		L2[J] = b2 / dJ;
	}
	// Solve L D Lᵀ γ = Qᵀy.
	const z = ws.z;
	for (let J = 0; J < N; J++) {
		let v = Qty[J];
		if (J >= 1) v -= L1[J - 1] * z[J - 1];
		if (J >= 2) v -= L2[J - 2] * z[J - 2];
		z[J] = v;
	}
	for (let J = 0; J < N; J++) z[J] /= D[J];
	for (let J = N - 1; J >= 0; J--) {
		let v = z[J];
		if (J + 1 < N) v -= L1[J] * z[J + 1];
		if (J + 2 < N) v -= L2[J] * z[J + 2];
		z[J] = v;
	}
	const gamma = ws.gamma;
	gamma[0] = 0;
	gamma[n - 1] = 0;
	for (let J = 0; J < N; J++) gamma[J + 1] = z[J];
	// g = y − λW⁻¹Qγ, with (Qγ)_i = Δγ_i/h_i − Δγ_{i−1}/h_{i−1} (missing terms dropped at the ends).
	const g = ws.g;
	const resid = ws.resid;
	let rss = 0;
	for (let i = 0; i < n; i++) {
		let qg = 0;
		if (i < n - 1) qg += (gamma[i + 1] - gamma[i]) / h[i];
		if (i > 0) qg -= (gamma[i] - gamma[i - 1]) / h[i - 1];
		const r = (lambda * qg) / w[i];
		g[i] = y[i] - r;
		resid[i] = r;
		rss += w[i] * r * r;
	}
	const leverage = ws.leverage;
	const oneMinus = ws.oneMinus;
	let edf = NaN;
	let gcv = NaN;
	if (full) {
		// Bands of Σ = B⁻¹ (Hutchinson & de Hoog), backwards from the last row.
		const { S0, S1, S2 } = ws;
		for (let J = N - 1; J >= 0; J--) {
			const l1 = J + 1 < N ? L1[J] : 0;
			const l2 = J + 2 < N ? L2[J] : 0;
			const s11 = J + 1 < N ? S0[J + 1] : 0;
			const s12 = J + 2 < N ? S1[J + 1] : 0;
			const s22 = J + 2 < N ? S0[J + 2] : 0;
			S2[J] = J + 2 < N ? -l1 * s12 - l2 * s22 : 0;
			S1[J] = J + 1 < N ? -l1 * s11 - l2 * s12 : 0;
			S0[J] = 1 / D[J] - l1 * S1[J] - l2 * S2[J];
		}
		// Σ between interior columns a ≤ b (|a − b| ≤ 2), in knot numbering 1..n−2.
		const sig = (a: number, b: number): number => {
			if (a > b) [a, b] = [b, a];
			const d = b - a;
			return d === 0 ? S0[a - 1] : d === 1 ? S1[a - 1] : S2[a - 1];
		};
		let tr = 0;
		const cols = [0, 0, 0];
		const vals = [0, 0, 0];
		for (let i = 0; i < n; i++) {
			// Row i of Q: columns i−1, i, i+1 that are interior (1..n−2).
			let k = 0;
			if (i - 1 >= 1) {
				cols[k] = i - 1;
				vals[k++] = 1 / h[i - 1];
			}
			if (i >= 1 && i <= n - 2) {
				cols[k] = i;
				vals[k++] = -1 / h[i - 1] - 1 / h[i];
			}
			if (i + 1 <= n - 2) {
				cols[k] = i + 1;
				vals[k++] = 1 / h[i];
			}
			let q = 0;
			for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) q += vals[a] * sig(cols[a], cols[b]) * vals[b];
			const om = (lambda * q) / w[i];
			oneMinus[i] = om;
			leverage[i] = 1 - om;
			tr += 1 - om;
		}
		edf = tr;
		const denom = n - tr;
		gcv = (n * rss) / (denom * denom);
	}
	return { lambda, g, resid, gamma, leverage, oneMinusLeverage: oneMinus, edf, rss, gcv };
}

/** GCV minimiser over λ > 0: log-spaced scan, then golden-section on the best bracket. */
function gcvLambda(bd: Bands): { lambda: number; atEdge: boolean } {
	let trR = 0;
	let trM = 0;
	for (let J = 0; J < bd.R0.length; J++) {
		trR += bd.R0[J];
		trM += bd.M0[J];
	}
	const l0 = Math.log10(trR / trM);
	const lo = l0 - 6;
	// tr A falls to 2 (a straight line) about n⁴ times above λ₀: scan to there and a bit beyond.
	const hi = l0 + 4 * Math.log10(bd.n) + 3;
	const step = 0.25;
	const ws = workspace(bd.n);
	// Far out in λ the system B ≈ λ·QᵀW⁻¹Q inherits that matrix's condition number (∝ n⁴)
	// and can stop being numerically positive definite; such λ are simply not candidates.
	const score = (u: number) => {
		try {
			return solveAt(bd, 10 ** u, true, ws).gcv;
		} catch (e) {
			if (e instanceof FitError && e.code === 'singular') return Infinity;
			throw e;
		}
	};
	let bestU = lo;
	let best = Infinity;
	const count = Math.ceil((hi - lo) / step);
	for (let k = 0; k <= count; k++) {
		const u = lo + k * step;
		const v = score(u);
		// Strictly smaller: on a flat GCV (exact data) the least smoothing that achieves it wins.
		if (v < best) {
			best = v;
			bestU = u;
		}
	}
	let a = bestU - step;
	let b = bestU + step;
	const atEdge = bestU <= lo || bestU >= lo + count * step;
	// Golden section: the bracket shrinks by 0.618 per evaluation; 60 steps take it below 1e-12 in log10 λ.
	const r = (Math.sqrt(5) - 1) / 2;
	let c = b - r * (b - a);
	let d = a + r * (b - a);
	let fc = score(c);
	let fd = score(d);
	for (let it = 0; it < 60 && b - a > 1e-12; it++) {
		if (fc <= fd) {
			b = d;
			d = c;
			fd = fc;
			c = b - r * (b - a);
			fc = score(c);
		} else {
			a = c;
			c = d;
			fc = fd;
			d = a + r * (b - a);
			fd = score(d);
		}
	}
	const u = fc <= fd ? c : d;
	return { lambda: 10 ** (Math.min(fc, fd) <= best ? u : bestU), atEdge };
}

/** The solution at a given λ (or the GCV λ) for prepared, strictly increasing data. */
export function solveSmoothingSpline(
	x: Float64Array,
	y: Float64Array,
	w: Float64Array | null,
	lambda?: number
): SmoothingSolution & { lambdaFromGcv: boolean; atEdge: boolean } {
	const ww = w ?? new Float64Array(x.length).fill(1);
	const bd = setupBands(x, y, ww);
	let atEdge = false;
	let lam = lambda;
	if (lam === undefined) {
		const r = gcvLambda(bd);
		lam = r.lambda;
		atEdge = r.atEdge;
	}
	return { ...solveAt(bd, lam, true), lambdaFromGcv: lambda === undefined, atEdge };
}

export function smoothingSpline(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): PiecewisePolynomial {
	const opts = resolveOptions(options, 'smoothing-spline');
	const fixed = opts.lambda;
	if (fixed !== undefined && !(typeof fixed === 'number' && Number.isFinite(fixed) && fixed >= 0)) {
		throw new FitError('bad-option', 'smoothing-spline: lambda must be a finite number ≥ 0');
	}
	const d = prepareData(x, y, opts, {
		label: 'smoothing-spline',
		minPoints: fixed === undefined ? 5 : 3,
		minReason: fixed === undefined ? 'choosing λ by cross-validation needs five' : 'the penalty needs an interior knot',
		acceptsWeights: true
	});
	const xs = d.x;
	const n = xs.length;
	const sol = solveSmoothingSpline(xs, d.y, d.w, fixed);
	const { g, gamma, resid } = sol;
	// Natural cubic from values g and second derivatives γ: on [x_i, x_{i+1}],
	// c0 = g_i, c1 = Δg/h − h(2γ_i + γ_{i+1})/6, c2 = γ_i/2, c3 = Δγ/(6h).
	// Δg is taken as Δy − Δr (r = y − g, the residuals): with a large offset in y
	// the rounded g_i have lost the low digits that Δg needs, while Δy (of the
	// stored values) and Δr are exact or small.
	const c = new Float64Array(4 * (n - 1));
	for (let i = 0, o = 0; i < n - 1; i++, o += 4) {
		const h = xs[i + 1] - xs[i];
		c[o] = g[i];
		c[o + 1] = (d.y[i + 1] - d.y[i] - (resid[i + 1] - resid[i])) / h - (h * (2 * gamma[i] + gamma[i + 1])) / 6;
		c[o + 2] = gamma[i] / 2;
		c[o + 3] = (gamma[i + 1] - gamma[i]) / (6 * h);
	}
	const notes = d.notes;
	if (sol.lambdaFromGcv) {
		notes.push(`λ = ${sol.lambda.toPrecision(6)} chosen by generalised cross-validation; effective degrees of freedom ${sol.edf.toFixed(3)} of ${n}`);
		if (sol.atEdge) notes.push('the GCV minimum sits at the edge of the searched λ range');
	}
	return new PiecewisePolynomial({
		method: 'smoothing-spline',
		continuity: 'C2',
		options: opts,
		knots: xs,
		degree: 3,
		coefficients: c,
		notes,
		stats: { lambda: sol.lambda, lambdaFromGcv: sol.lambdaFromGcv, edf: sol.edf, gcv: sol.gcv, rss: sol.rss, leverage: sol.leverage }
	});
}
