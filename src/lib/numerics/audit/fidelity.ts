/**
 * Fidelity audit: how faithful a fit is to its data.
 *
 * - Leave-one-out error. For a linear smoother with hat matrix A (least-squares
 *   polynomial; smoothing spline at its λ) the prediction error at x_i when
 *   row i is left out is exactly (y_i − f(x_i))/(1 − A_ii) (P. Craven,
 *   G. Wahba, 1979, Numer. Math. 31:377–403, Lemma 3.1; P. J. Green,
 *   B. W. Silverman, 1994, §3.2.2). Every other method is refitted without
 *   the row (the end rows are then predicted by extrapolation, see below);
 *   local methods are refitted on the rows around it only, with the same
 *   result (see LOCAL_REACH); beyond `looMaxPoints` rows an evenly spread subset is refitted and the
 *   result says how many rows were used. The natural and smoothing splines
 *   predict the end rows by linear extrapolation (their minimum-∫f″²
 *   definition continues linearly); other methods extend the edge piece.
 * - Overshoot: on each data interval [x_i, x_{i+1}], how far the fit leaves
 *   [min(y_i, y_{i+1}), max(y_i, y_{i+1})]. Piecewise fits are examined at the
 *   analytic extrema of each piece (roots of the quadratic f′ of a cubic) and
 *   at piece ends; every fit is also sampled densely.
 * - Monotonicity: if the data never decrease (or never increase), does f′
 *   keep that sign everywhere? f′ is checked at its own extrema on each piece
 *   (analytically) and on the dense sample.
 * - Spurious extrema: sign changes of f′ (a slope that flips across a knot
 *   counts too) that do not correspond to a turn of the data at a
 *   neighbouring point.
 * - Derivative check: at seeded random points, analytic f′ and f″ against
 *   central differences of f and f′ (steps h and h/2 combined by Richardson
 *   extrapolation, h = ε^(1/5)·local length, error ≈ ε^(4/5)), kept inside one
 *   piece; the worst relative mismatch is reported.
 */
import { fitCurve } from '../fits/fitCurve';
import { PiecewisePolynomial } from '../fits/piecewisePolynomial';
import { prepareData } from '../fits/prepareData';
import type { CurveFit } from '../fits/types';
import { FIFTH_ROOT_EPSILON, mulberry32 } from '../math';

export interface FidelityAudit {
	/** root-mean-square leave-one-out prediction error (y units) */
	looRmse: number;
	/** largest |leave-one-out error| and where */
	looMax: number;
	looMaxAt: number;
	/** 'closed-form' (hat matrix) or 'refit' */
	looMethod: 'closed-form' | 'refit';
	/** rows whose leave-one-out error entered the statistics */
	looPoints: number;
	/** largest excursion beyond the neighbouring data values (y units, ≥ 0) and where */
	overshoot: number;
	overshootAt: number | null;
	/** overshoot / (max y − min y) */
	overshootRelative: number;
	/** the data's direction when they are monotone, else null */
	dataMonotone: 'increasing' | 'decreasing' | null;
	/** data monotone ⇒ fit monotone in the same direction (true when the data are not monotone) */
	monotoneKept: boolean;
	/** most negative f′ against the data's direction (0 when none), and where */
	monotoneWorst: number;
	monotoneWorstAt: number | null;
	/** number of extrema of the fit with no matching turn in the data, and where they are */
	spuriousExtrema: number;
	spuriousAt: number[];
	/** analytic vs central-difference derivatives */
	derivativeCheck: { points: number; worstD1: number; worstD1At: number; worstD2: number; worstD2At: number };
	notes: string[];
}

export interface FidelityOptions {
	/** seed of the derivative-check points (default 1) */
	seed?: number;
	/** dense samples per data interval for overshoot and monotonicity (default 16) */
	samplesPerInterval?: number;
	/** refit-based leave-one-out uses at most this many rows (default 200) */
	looMaxPoints?: number;
	/** points in the derivative check (default 200) */
	derivativePoints?: number;
}

/** Roots of c1 + 2c2·s + 3c3·s² (f′ of one piece) inside (0, len). */
function pieceSlopeRoots(c: Float64Array, o: number, degree: number, len: number, out: number[]): void {
	if (degree < 2) return;
	const a = degree === 3 ? 3 * c[o + 3] : 0;
	const b = 2 * c[o + 2];
	const k = c[o + 1];
	if (a === 0) {
		if (b !== 0) {
			const s = -k / b;
			if (s > 0 && s < len) out.push(s);
		}
		return;
	}
	const disc = b * b - 4 * a * k;
	if (disc < 0) return;
	// Cancellation-free quadratic roots: q = −(b + sign(b)√disc)/2, roots q/a and k/q.
	const q = -0.5 * (b + (b >= 0 ? 1 : -1) * Math.sqrt(disc));
	const r1 = q / a;
	const r2 = q !== 0 ? k / q : r1;
	for (const s of r1 <= r2 ? [r1, r2] : [r2, r1]) if (s > 0 && s < len) out.push(s);
}

/**
 * Points where f and f′ are worth examining: every piece end (both one-sided
 * limits), the analytic zeros of f′ and the vertex of f′ in each piece, and a
 * dense sample. Returned sorted, with the piece each belongs to (−1 = use evaluate).
 */
function examinationPoints(fit: CurveFit, dataX: Float64Array, perInterval: number): { x: number[]; piece: number[] } {
	const xs: number[] = [];
	const ps: number[] = [];
	if (fit instanceof PiecewisePolynomial) {
		const k = fit.knots;
		const c = fit.coefficients;
		const st = fit.degree + 1;
		const roots: number[] = [];
		for (let i = 0; i < fit.pieces; i++) {
			const len = k[i + 1] - k[i];
			xs.push(k[i]);
			ps.push(i);
			roots.length = 0;
			pieceSlopeRoots(c, st * i, fit.degree, len, roots);
			// The vertex of f′ (where f″ = 0) is where f′ is extreme on the piece.
			if (fit.degree === 3 && c[st * i + 3] !== 0) {
				const v = -c[st * i + 2] / (3 * c[st * i + 3]);
				if (v > 0 && v < len) roots.push(v);
			}
			for (let r = 1; r < perInterval; r++) roots.push((len * r) / perInterval);
			roots.sort((a, b) => a - b);
			for (const s of roots) {
				xs.push(k[i] + s);
				ps.push(i);
			}
			xs.push(k[i + 1]);
			ps.push(i);
		}
	} else {
		for (let i = 0; i + 1 < dataX.length; i++) {
			for (let r = 0; r < perInterval; r++) {
				xs.push(dataX[i] + ((dataX[i + 1] - dataX[i]) * r) / perInterval);
				ps.push(-1);
			}
		}
		xs.push(dataX[dataX.length - 1]);
		ps.push(-1);
	}
	return { x: xs, piece: ps };
}

export function auditFidelity(fit: CurveFit, xIn: ArrayLike<number>, yIn: ArrayLike<number>, options: FidelityOptions = {}): FidelityAudit {
	const notes: string[] = [];
	const d = prepareData(xIn, yIn, fit.options, { label: fit.method, minPoints: 2, acceptsWeights: true });
	const x = d.x;
	const y = d.y;
	const n = x.length;
	const perInterval = Math.max(2, options.samplesPerInterval ?? 16);
	let yMin = Infinity;
	let yMax = -Infinity;
	for (let i = 0; i < n; i++) {
		yMin = Math.min(yMin, y[i]);
		yMax = Math.max(yMax, y[i]);
	}
	const yRange = yMax - yMin > 0 ? yMax - yMin : Math.max(Math.abs(yMax), 1);
	const xRange = x[n - 1] - x[0];
	const at = (xv: number, piece: number) => (piece >= 0 ? fit.evaluatePiece(piece, xv) : fit.evaluate(xv));

	// ---- Leave-one-out.
	const loo = leaveOneOut(fit, x, y, d.w, options.looMaxPoints ?? 200, notes);

	// ---- Overshoot, monotonicity and extrema from one examination pass.
	const ex = examinationPoints(fit, x, perInterval);
	let overshoot = 0;
	let overshootAt: number | null = null;
	let iv = 0;
	const slopeTol = 1e-10 * (yRange / xRange);
	let up = true;
	let down = true;
	for (let i = 1; i < n; i++) {
		if (y[i] < y[i - 1]) up = false;
		if (y[i] > y[i - 1]) down = false;
	}
	const dataMonotone: FidelityAudit['dataMonotone'] = up && !down ? 'increasing' : down && !up ? 'decreasing' : null;
	let monotoneWorst = 0;
	let monotoneWorstAt: number | null = null;
	// Sign of f′ along the examination points, zeros (within tolerance) skipped.
	const signs: { s: number; x: number }[] = [];
	let lastSigned = -Infinity;
	let lastZero = -Infinity;
	for (let p = 0; p < ex.x.length; p++) {
		const xv = ex.x[p];
		if (xv < x[0] || xv > x[n - 1]) continue;
		const j = at(xv, ex.piece[p]);
		// Data interval holding xv (points are sorted, so the cursor only advances).
		while (iv < n - 2 && xv > x[iv + 1]) iv++;
		const lo = Math.min(y[iv], y[iv + 1]);
		const hi = Math.max(y[iv], y[iv + 1]);
		const exc = Math.max(j.f - hi, lo - j.f, 0);
		// A knot shared by two data intervals is judged against the more lenient one.
		let excAlt = exc;
		if (xv === x[iv + 1] && iv + 2 < n) {
			const lo2 = Math.min(y[iv + 1], y[iv + 2]);
			const hi2 = Math.max(y[iv + 1], y[iv + 2]);
			excAlt = Math.max(j.f - hi2, lo2 - j.f, 0);
		}
		const e = Math.min(exc, excAlt);
		if (e > overshoot) {
			overshoot = e;
			overshootAt = xv;
		}
		if (dataMonotone) {
			const against = dataMonotone === 'increasing' ? -j.df : j.df;
			if (against > monotoneWorst) {
				monotoneWorst = against;
				monotoneWorstAt = xv;
			}
		}
		if (Math.abs(j.df) > slopeTol) {
			const s = j.df > 0 ? 1 : -1;
			if (signs.length === 0 || signs[signs.length - 1].s !== s) {
				// Locate the turn: at the zero of f′ met on the way (an analytic root), or by
				// bisection between the last point of the old sign and this one.
				let at = xv;
				if (signs.length > 0) at = lastZero > lastSigned ? lastZero : bisectSlope(fit, lastSigned, xv, -s);
				signs.push({ s, x: at });
			}
			lastSigned = xv;
		} else lastZero = xv;
	}
	const monotoneKept = dataMonotone === null || monotoneWorst <= slopeTol;

	// ---- Extrema: turns of f′ vs turns of the data.
	const fitTurns: { x: number; max: boolean }[] = [];
	for (let t = 1; t < signs.length; t++) fitTurns.push({ x: signs[t].x, max: signs[t - 1].s > 0 });
	const dataTurns: { lo: number; hi: number; max: boolean; used: boolean }[] = [];
	{
		let prevSign = 0;
		let prevIdx = 0; // start of the last non-flat secant's right end
		for (let i = 0; i + 1 < n; i++) {
			const dy = y[i + 1] - y[i];
			if (dy === 0) continue;
			const s = dy > 0 ? 1 : -1;
			if (prevSign !== 0 && s !== prevSign) {
				// The turn happens on the (possibly flat) run x[prevIdx] … x[i]; accept a fit
				// extremum anywhere from the data point before to the one after.
				dataTurns.push({ lo: x[Math.max(prevIdx - 1, 0)], hi: x[Math.min(i + 1, n - 1)], max: prevSign > 0, used: false });
			}
			prevSign = s;
			prevIdx = i + 1;
		}
	}
	// Both lists are in increasing x: sweep them together (data turns whose window ends
	// before the current fit turn can match no later one).
	const spuriousAt: number[] = [];
	let first = 0;
	for (const ft of fitTurns) {
		while (first < dataTurns.length && dataTurns[first].hi < ft.x) first++;
		let match = -1;
		for (let q = first; q < dataTurns.length && dataTurns[q].lo <= ft.x; q++) {
			const dt = dataTurns[q];
			if (!dt.used && dt.max === ft.max && ft.x <= dt.hi) {
				match = q;
				break;
			}
		}
		if (match >= 0) dataTurns[match].used = true;
		else spuriousAt.push(ft.x);
	}

	// ---- Derivative check.
	const derivativeCheck = checkDerivatives(fit, options.derivativePoints ?? 200, options.seed ?? 1, (x[n - 1] - x[0]) / (n - 1));

	return {
		looRmse: loo.rmse,
		looMax: loo.max,
		looMaxAt: loo.maxAt,
		looMethod: loo.method,
		looPoints: loo.points,
		overshoot,
		overshootAt,
		overshootRelative: overshoot / yRange,
		dataMonotone,
		monotoneKept,
		monotoneWorst,
		monotoneWorstAt,
		spuriousExtrema: spuriousAt.length,
		spuriousAt,
		derivativeCheck,
		notes
	};
}

const LOCAL_METHODS: ReadonlySet<string> = new Set(['linear', 'pchip', 'akima-modified', 'local-quadratic', 'local-cubic', 'softened-linear']);
const LOCAL_REACH = 6;

function leaveOneOut(
	fit: CurveFit,
	x: Float64Array,
	y: Float64Array,
	w: Float64Array | null,
	maxPoints: number,
	notes: string[]
): { rmse: number; max: number; maxAt: number; method: 'closed-form' | 'refit'; points: number } {
	const n = x.length;
	const lev = fit.stats.leverage;
	let sum = 0;
	let max = 0;
	let maxAt = NaN;
	let count = 0;
	if (lev && lev.length === n && lev.every((v) => 1 - v > 1e-10)) {
		for (let i = 0; i < n; i++) {
			const e = (y[i] - fit.evaluate(x[i]).f) / (1 - lev[i]);
			sum += e * e;
			if (Math.abs(e) > max) {
				max = Math.abs(e);
				maxAt = x[i];
			}
		}
		return { rmse: Math.sqrt(sum / n), max, maxAt, method: 'closed-form', points: n };
	}
	// Refit without each (selected) row, on the cleaned data; the end rows by extrapolation.
	const idx: number[] = [];
	if (n <= maxPoints) for (let i = 0; i < n; i++) idx.push(i);
	else {
		for (let k = 0; k < maxPoints; k++) idx.push(Math.round((k * (n - 1)) / (maxPoints - 1)));
		notes.push(`leave-one-out estimated on ${maxPoints} of ${n} rows (evenly spread)`);
	}
	const xr = new Float64Array(n - 1);
	const yr = new Float64Array(n - 1);
	// Only the weighted methods take weights (averaged duplicates carry them too).
	const weighted = fit.method === 'smoothing-spline' || fit.method === 'polynomial-least-squares';
	const wr = w && weighted ? new Array<number>(n - 1) : undefined;
	// The end rows are predicted by extrapolating the refit: linearly for the methods whose
	// variational definition continues linearly beyond the data (natural and smoothing
	// splines minimise ∫f″², so f″ = 0 outside), otherwise by extending the edge piece.
	const outward = fit.method === 'cubic-natural' || fit.method === 'smoothing-spline' ? ('linear' as const) : ('extend' as const);
	const baseOptions = { ...fit.options, extrapolation: outward, duplicates: 'error' as const, nonFinite: 'error' as const };
	if (fit.method === 'smoothing-spline' && fit.stats.lambda !== undefined) baseOptions.lambda = fit.stats.lambda;
	// Local methods: the prediction at x_i depends on at most three neighbours each side
	// (slopes and stencils reach two knots; end rules three), so refitting the twelve
	// rows around it gives exactly the full refit's value at O(1) cost. Original Akima is
	// refitted whole: its tie threshold is relative to the largest weight over all knots.
	const local = LOCAL_METHODS.has(fit.method);
	let failed = 0;
	for (const i of idx) {
		const from = local ? Math.max(0, i - LOCAL_REACH) : 0;
		const to = local ? Math.min(n - 1, i + LOCAL_REACH) : n - 1;
		let k = 0;
		for (let j = from; j <= to; j++) {
			if (j === i) continue;
			xr[k] = x[j];
			yr[k] = y[j];
			if (wr) wr[k] = w![j];
			k++;
		}
		let pred: number;
		try {
			const xs = k === n - 1 ? xr : xr.subarray(0, k);
			const ys = k === n - 1 ? yr : yr.subarray(0, k);
			const g = fitCurve(fit.method, xs, ys, wr ? { ...baseOptions, weights: wr.slice(0, k) } : { ...baseOptions, weights: undefined });
			pred = g.evaluate(x[i]).f;
		} catch {
			failed++;
			continue;
		}
		const e = y[i] - pred;
		sum += e * e;
		count++;
		if (Math.abs(e) > max) {
			max = Math.abs(e);
			maxAt = x[i];
		}
	}
	if (failed > 0) notes.push(`leave-one-out: ${failed} refit${failed > 1 ? 's' : ''} impossible (too few points left)`);
	return { rmse: count > 0 ? Math.sqrt(sum / count) : NaN, max: count > 0 ? max : NaN, maxAt, method: 'refit', points: count };
}

function checkDerivatives(fit: CurveFit, points: number, seed: number, meanSpacing: number): FidelityAudit['derivativeCheck'] {
	const rnd = mulberry32(seed);
	const [a, b] = fit.domain;
	const W = b - a;
	const k = fit.knots;
	const piecewise = k.length >= 2;
	const samples: { x: number; d1: number; d1fd: number; d2: number; d2fd: number }[] = [];
	let s1 = 0;
	let s2 = 0;
	for (let p = 0; p < points; p++) {
		let xv = a + W * rnd();
		// Step ε^(1/5) times the local length scale (the piece, or the mean data spacing of a
		// global form): after Richardson extrapolation truncation is ∝ h⁴·f⁽⁵⁾ (and f⁽⁵⁾ scales
		// like f/L⁵) and rounding ∝ ε·f/h, which balance near ε^(4/5) whatever the units.
		let h: number;
		let piece = 0;
		if (piecewise) {
			let lo = 0;
			let hi = k.length - 1;
			while (hi - lo > 1) {
				const mid = (lo + hi) >>> 1;
				if (xv < k[mid]) hi = mid;
				else lo = mid;
			}
			piece = lo;
			const len = k[lo + 1] - k[lo];
			h = FIFTH_ROOT_EPSILON * len;
			// Keep x ± h well inside the piece so both differences see one polynomial.
			xv = Math.min(Math.max(xv, k[lo] + 3 * h), k[lo + 1] - 3 * h);
		} else {
			h = FIFTH_ROOT_EPSILON * meanSpacing;
			xv = Math.min(Math.max(xv, a + 3 * h), b - 3 * h);
		}
		const ev = (v: number) => (piecewise ? fit.evaluatePiece(piece, v) : fit.evaluate(v));
		const j0 = ev(xv);
		// Central differences at steps h and h/2, combined by Richardson extrapolation
		// (L. F. Richardson, 1911): (4·D(h/2) − D(h))/3 cancels the h² term, leaving O(h⁴).
		const central = (step: number) => {
			const jm = ev(xv - step);
			const jp = ev(xv + step);
			const hh = xv + step - (xv - step); // the step actually represented in floating point
			return [(jp.f - jm.f) / hh, (jp.df - jm.df) / hh];
		};
		const [a1, a2] = central(h);
		const [b1, b2] = central(h / 2);
		const d1fd = (4 * b1 - a1) / 3;
		const d2fd = (4 * b2 - a2) / 3;
		s1 = Math.max(s1, Math.abs(j0.df));
		s2 = Math.max(s2, Math.abs(j0.d2f));
		samples.push({ x: xv, d1: j0.df, d1fd, d2: j0.d2f, d2fd });
	}
	// Relative to the largest derivative seen, so a derivative crossing zero does not blow up the ratio.
	const S1 = s1 > 0 ? s1 : 1;
	const S2 = s2 > 0 ? s2 : 1;
	let worstD1 = 0;
	let worstD1At = NaN;
	let worstD2 = 0;
	let worstD2At = NaN;
	for (const s of samples) {
		const e1 = Math.abs(s.d1 - s.d1fd) / S1;
		const e2 = Math.abs(s.d2 - s.d2fd) / S2;
		if (e1 > worstD1) {
			worstD1 = e1;
			worstD1At = s.x;
		}
		if (e2 > worstD2) {
			worstD2 = e2;
			worstD2At = s.x;
		}
	}
	return { points, worstD1, worstD1At, worstD2, worstD2At };
}


/** The point in [a, b] where f′ leaves the sign `from` (f′ has sign `from` at a and not at b). */
function bisectSlope(fit: CurveFit, a: number, b: number, from: number): number {
	for (let k = 0; k < 60 && b - a > 0; k++) {
		const m = 0.5 * (a + b);
		if (m <= a || m >= b) break;
		if (Math.sign(fit.evaluate(m).df) === from) a = m;
		else b = m;
	}
	return b;
}
