/**
 * Smoothness audit: the continuity class a fit states, and the class it
 * actually has, measured from exact one-sided limits at every interior knot.
 *
 * At knot k the left limit is the left piece's own polynomial evaluated at the
 * knot, evaluatePiece(k − 1, knots[k]), and the right limit is
 * evaluatePiece(k, knots[k]) — no finite differences, so a jump is the jump,
 * not a truncation error. Jumps are right limit minus left limit.
 *
 * Thresholds. A jump counts as zero when it is below rel = 1e-9 (default) of a
 * scale built from the fit's own magnitudes, so the verdict does not depend
 * on the units of x or y:
 *     S0 = max |f| over all one-sided limits at the knots
 *     S1 = max( max |f′| at the knots, S0/hmin )
 *     S2 = max( max |f″| at the knots, S1/hmin, S0/hmin² )
 * with hmin the shortest piece. Rounding in a piece's coefficients is of order
 * ε·S0/h in f′ and ε·S0/h² in f″ (they come from differences of data values
 * divided by spacings), so these scales bound the rounding noise with a wide
 * margin (1e-9 ≈ 4.5e6·ε) while any real jump above a billionth of the scale
 * is reported. The measured class is the highest k ≤ 2 with every jump of
 * f, …, f^(k) below its threshold; a fit with no interior knot is a single
 * polynomial, hence C∞.
 */
import type { Continuity, CurveFit } from '../fits/types';

export type MeasuredContinuity = Continuity | 'discontinuous';

export interface KnotJump {
	/** knot index (into fit.knots) */
	knot: number;
	x: number;
	jumpF: number;
	jumpD1: number;
	jumpD2: number;
}

export interface SmoothnessAudit {
	declared: Continuity;
	measured: MeasuredContinuity;
	/** the most severe knots first: value jumps, then slope jumps, then curvature jumps, each relative to its threshold */
	worst: KnotJump[];
	/** largest |jump| of f, f′, f″ over all interior knots (0 when none) */
	maxJumpF: number;
	maxJumpD1: number;
	maxJumpD2: number;
	/** the thresholds below which a jump counts as zero */
	tolerance: { f: number; d1: number; d2: number };
	/** interior knots examined */
	knotsChecked: number;
}

export interface SmoothnessOptions {
	/** how many knots to list in `worst` (default 5) */
	worst?: number;
	/** relative threshold (default 1e-9) */
	rel?: number;
}

const RANK: Record<MeasuredContinuity, number> = { discontinuous: -1, C0: 0, C1: 1, C2: 2, Cinf: 3 };

/** Compare two classes: negative when a is below b. */
export function compareContinuity(a: MeasuredContinuity, b: MeasuredContinuity): number {
	return RANK[a] - RANK[b];
}

export function auditSmoothness(fit: CurveFit, options: SmoothnessOptions = {}): SmoothnessAudit {
	const rel = options.rel ?? 1e-9;
	const nWorst = options.worst ?? 5;
	const k = fit.knots;
	const interior = Math.max(0, k.length - 2);
	if (interior === 0) {
		return {
			declared: fit.continuity,
			measured: 'Cinf',
			worst: [],
			maxJumpF: 0,
			maxJumpD1: 0,
			maxJumpD2: 0,
			tolerance: { f: 0, d1: 0, d2: 0 },
			knotsChecked: 0
		};
	}
	const jumps: KnotJump[] = new Array(interior);
	let s0 = 0;
	let d1max = 0;
	let d2max = 0;
	let hmin = Infinity;
	for (let i = 1; i < k.length; i++) hmin = Math.min(hmin, k[i] - k[i - 1]);
	const scan = (j: { f: number; df: number; d2f: number }) => {
		s0 = Math.max(s0, Math.abs(j.f));
		d1max = Math.max(d1max, Math.abs(j.df));
		d2max = Math.max(d2max, Math.abs(j.d2f));
	};
	scan(fit.evaluatePiece(0, k[0]));
	scan(fit.evaluatePiece(k.length - 2, k[k.length - 1]));
	let maxF = 0;
	let maxD1 = 0;
	let maxD2 = 0;
	for (let i = 1; i <= interior; i++) {
		const x = k[i];
		const L = fit.evaluatePiece(i - 1, x);
		const R = fit.evaluatePiece(i, x);
		scan(L);
		scan(R);
		const j: KnotJump = { knot: i, x, jumpF: R.f - L.f, jumpD1: R.df - L.df, jumpD2: R.d2f - L.d2f };
		jumps[i - 1] = j;
		maxF = Math.max(maxF, Math.abs(j.jumpF));
		maxD1 = Math.max(maxD1, Math.abs(j.jumpD1));
		maxD2 = Math.max(maxD2, Math.abs(j.jumpD2));
	}
	const S0 = s0 > 0 ? s0 : 1;
	const S1 = Math.max(d1max, S0 / hmin);
	const S2 = Math.max(d2max, S1 / hmin, S0 / (hmin * hmin));
	const tol = { f: rel * S0, d1: rel * S1, d2: rel * S2 };

	let measured: MeasuredContinuity;
	if (maxF > tol.f) measured = 'discontinuous';
	else if (maxD1 > tol.d1) measured = 'C0';
	else if (maxD2 > tol.d2) measured = 'C1';
	else measured = 'C2';

	const severity = (j: KnotJump): [number, number, number] => [
		Math.abs(j.jumpF) > tol.f ? Math.abs(j.jumpF) / S0 : 0,
		Math.abs(j.jumpD1) > tol.d1 ? Math.abs(j.jumpD1) / S1 : 0,
		Math.abs(j.jumpD2) > tol.d2 ? Math.abs(j.jumpD2) / S2 : 0
	];
	const keyed = jumps.map((j) => ({ j, s: severity(j) }));
	keyed.sort((a, b) => b.s[0] - a.s[0] || b.s[1] - a.s[1] || b.s[2] - a.s[2] || Math.abs(b.j.jumpD2) - Math.abs(a.j.jumpD2));
	return {
		declared: fit.continuity,
		measured,
		worst: keyed.slice(0, nWorst).map((e) => e.j),
		maxJumpF: maxF,
		maxJumpD1: maxD1,
		maxJumpD2: maxD2,
		tolerance: tol,
		knotsChecked: interior
	};
}
