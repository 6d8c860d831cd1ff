/**
 * Knot slopes of the interpolating cubic spline (the first-derivative, or
 * "slope", formulation): C. de Boor, 1978, A Practical Guide to Splines,
 * Springer, chapter IV. Continuity of f″ at interior knot i gives
 *
 *   h_i·s_{i−1} + 2(h_{i−1} + h_i)·s_i + h_{i−1}·s_{i+1} = 3(h_i·m_{i−1} + h_{i−1}·m_i)
 *
 * (h = spacing, m = secant), closed by one end condition at each end. The rows
 * and end rows are those of SciPy's CubicSpline, so both solve the same system.
 * The tridiagonal system is solved by the Thomas algorithm (L. H. Thomas, 1949,
 * "Elliptic problems in linear difference equations over a network", Watson
 * Sci. Comput. Lab. report): no pivoting is needed because every pivot stays
 * positive — the interior rows are diagonally dominant, and after eliminating
 * a not-a-knot end row the next pivot is h_0 + h_1 > 0 (see the notes below).
 */

import { stridedValues } from '../math';
export type SplineEnd =
	| { kind: 'natural' }
	| { kind: 'not-a-knot' }
	| { kind: 'clamped'; slope: number };

/** The knot slopes as a new array (see cubicSplineSlopesInto). */
export function cubicSplineSlopes(x: Float64Array, y: ArrayLike<number>, start: SplineEnd, end: SplineEnd): Float64Array {
	return stridedValues(x.length, (buf) => cubicSplineSlopesInto(x, y, start, end, buf, 2, 0, 1));
}

/**
 * Solves for the knot slopes, writing s_i to buf[offset + stride·i] and using
 * buf[scratch + stride·i] for the sweep's modified super-diagonal — so the
 * solve needs no memory beyond the caller's buffer (the cubic builders pass
 * their coefficient buffer: slopes in slot 1, scratch in slot 2 of each piece).
 * The values are y[yo + i] (the grid fits pass one line of a larger plane).
 */
export function cubicSplineSlopesInto(
	x: Float64Array,
	y: ArrayLike<number>,
	start: SplineEnd,
	end: SplineEnd,
	buf: Float64Array,
	stride: number,
	offset: number,
	scratch: number,
	yo = 0
): void {
	const n = x.length;
	const N = n - 1;
	const S = (i: number) => offset + stride * i;
	const C = (i: number) => scratch + stride * i;
	if (n === 2) {
		// One interval: not-a-knot and natural both give the straight line (as SciPy).
		const m = (y[yo + 1] - y[yo]) / (x[1] - x[0]);
		let s0 = start.kind === 'clamped' ? start.slope : m;
		let s1 = end.kind === 'clamped' ? end.slope : m;
		if (start.kind === 'natural' && end.kind === 'clamped') s0 = (3 * m - s1) / 2;
		if (end.kind === 'natural' && start.kind === 'clamped') s1 = (3 * m - s0) / 2;
		buf[S(0)] = s0;
		buf[S(1)] = s1;
		return;
	}
	const notAKnot3 = n === 3 && start.kind === 'not-a-knot' && end.kind === 'not-a-knot';

	// Row 0.
	let b0: number;
	let c0: number;
	let r0: number;
	const h0 = x[1] - x[0];
	const h1 = x[2] - x[1];
	const m0 = (y[yo + 1] - y[yo]) / h0;
	const m1 = (y[yo + 2] - y[yo + 1]) / h1;
	if (notAKnot3) {
		// Three points, not-a-knot at both ends: the two conditions coincide; the
		// spline is the parabola through the points (as SciPy): s0 + s1 = 2·m0.
		b0 = 1;
		c0 = 1;
		r0 = 2 * m0;
	} else if (start.kind === 'not-a-knot') {
		const d = x[2] - x[0];
		b0 = h1;
		c0 = d;
		r0 = ((h0 + 2 * d) * h1 * m0 + h0 * h0 * m1) / d;
	} else if (start.kind === 'natural') {
		b0 = 2 * h0;
		c0 = h0;
		r0 = 3 * (y[yo + 1] - y[yo]);
	} else {
		b0 = 1;
		c0 = 0;
		r0 = start.slope;
	}
	// cp = the sweep's modified super-diagonal, sp = its modified right-hand side
	// (kept in registers; written to the buffer for the back substitution).
	let cp = c0 / b0;
	let sp = r0 / b0;
	buf[C(0)] = cp;
	buf[S(0)] = sp;

	// Interior rows 1..N−1, fused with the forward sweep.
	let mPrev = m0;
	let xl = x[0];
	let xc = x[1];
	let yc = y[yo + 1];
	for (let i = 1; i < N; i++) {
		const xr = x[i + 1];
		const yr = y[yo + i + 1];
		const hl = xc - xl;
		const hr = xr - xc;
		const mr = (yr - yc) / hr;
		const denom = 2 * (hl + hr) - hr * cp;
		cp = hl / denom;
		sp = (3 * (hr * mPrev + hl * mr) - hr * sp) / denom;
		buf[scratch + stride * i] = cp;
		buf[offset + stride * i] = sp;
		mPrev = mr;
		xl = xc;
		xc = xr;
		yc = yr;
	}

	// Row N.
	let aN: number;
	let bN: number;
	let rN: number;
	const hN1 = x[N] - x[N - 1];
	const hN2 = x[N - 1] - x[N - 2];
	const mN1 = (y[yo + N] - y[yo + N - 1]) / hN1;
	const mN2 = (y[yo + N - 1] - y[yo + N - 2]) / hN2;
	if (notAKnot3) {
		aN = 1;
		bN = 1;
		rN = 2 * mN1;
	} else if (end.kind === 'not-a-knot') {
		// Pivot h_{N−2} − (h_{N−1} + h_{N−2})·cp_{N−1} stays positive: the previous
		// pivot is at least 2h_{N−2} + h_{N−1} > h_{N−1} + h_{N−2}.
		const d = x[N] - x[N - 2];
		aN = d;
		bN = hN2;
		rN = (hN1 * hN1 * mN2 + (2 * d + hN1) * hN2 * mN1) / d;
	} else if (end.kind === 'natural') {
		aN = hN1;
		bN = 2 * hN1;
		rN = 3 * (y[yo + N] - y[yo + N - 1]);
	} else {
		aN = 0;
		bN = 1;
		rN = end.slope;
	}
	let next = (rN - aN * sp) / (bN - aN * cp);
	buf[S(N)] = next;
	for (let i = N - 1; i >= 0; i--) {
		next = buf[offset + stride * i] - buf[scratch + stride * i] * next;
		buf[offset + stride * i] = next;
	}
}

/**
 * The same knot slopes for many lines that share one x (the grid lines of one
 * input): the tridiagonal matrix depends on x alone, so its Thomas factors
 * (modified super-diagonal and reciprocal pivots) and the right-hand side's
 * weights on the secants are computed once, and each line costs one sweep of
 * multiplications and additions. Natural and not-a-knot ends, the rows of
 * cubicSplineSlopesInto; three points or fewer go to cubicSplineSlopesInto
 * (its special cases).
 */
export class SplineLineSolver {
	private readonly n: number;
	private readonly end: SplineEnd;
	private readonly x: Float64Array;
	private readonly invH: Float64Array;
	/** r_i = wPrev_i·m_{i−1} + wHere_i·m_i (row 0: m_0, m_1; row N: m_{N−2}, m_{N−1} in wPrev, wHere) */
	private readonly wPrev: Float64Array;
	private readonly wHere: Float64Array;
	private readonly sub: Float64Array;
	private readonly cp: Float64Array;
	private readonly inv: Float64Array;
	/** the one-line solve's buffer for three knots or fewer (slopes and scratch interleaved) */
	private readonly small = new Float64Array(6);

	constructor(x: Float64Array, kind: 'natural' | 'not-a-knot') {
		const n = x.length;
		this.n = n;
		this.x = x;
		this.end = { kind };
		const N = n - 1;
		this.invH = new Float64Array(Math.max(N, 0));
		this.wPrev = new Float64Array(n);
		this.wHere = new Float64Array(n);
		this.sub = new Float64Array(n);
		this.cp = new Float64Array(n);
		this.inv = new Float64Array(n);
		if (n <= 3) return;
		for (let i = 0; i < N; i++) this.invH[i] = 1 / (x[i + 1] - x[i]);
		const h0 = x[1] - x[0];
		const h1 = x[2] - x[1];
		let b0: number;
		let c0: number;
		if (kind === 'not-a-knot') {
			const d = x[2] - x[0];
			b0 = h1;
			c0 = d;
			this.wPrev[0] = ((h0 + 2 * d) * h1) / d;
			this.wHere[0] = (h0 * h0) / d;
		} else {
			b0 = 2 * h0;
			c0 = h0;
			this.wPrev[0] = 3 * h0;
		}
		this.inv[0] = 1 / b0;
		this.cp[0] = c0 / b0;
		for (let i = 1; i < N; i++) {
			const hl = x[i] - x[i - 1];
			const hr = x[i + 1] - x[i];
			this.wPrev[i] = 3 * hr;
			this.wHere[i] = 3 * hl;
			this.sub[i] = hr;
			this.inv[i] = 1 / (2 * (hl + hr) - hr * this.cp[i - 1]);
			this.cp[i] = hl * this.inv[i];
		}
		const hN1 = x[N] - x[N - 1];
		const hN2 = x[N - 1] - x[N - 2];
		let aN: number;
		let bN: number;
		if (kind === 'not-a-knot') {
			const d = x[N] - x[N - 2];
			aN = d;
			bN = hN2;
			this.wPrev[N] = (hN1 * hN1) / d;
			this.wHere[N] = ((2 * d + hN1) * hN2) / d;
		} else {
			aN = hN1;
			bN = 2 * hN1;
			this.wHere[N] = 3 * hN1;
		}
		this.sub[N] = aN;
		this.inv[N] = 1 / (bN - aN * this.cp[N - 1]);
	}

	/**
	 * `count` lines at once: line l has its values at y[yo + l·yStep + i] and
	 * its slopes go to out[oo + l·oStep + os·i]. Why pairs: each sweep is a
	 * chain of dependent multiply–adds, so one line leaves the FPU waiting;
	 * two independent chains in one loop nearly halve the time per line.
	 */
	solveLines(y: ArrayLike<number>, yo: number, yStep: number, out: Float64Array, oo: number, os: number, oStep: number, count: number): void {
		let l = 0;
		if (this.n > 3) for (; l + 1 < count; l += 2) this.solvePair(y, yo + l * yStep, yo + (l + 1) * yStep, out, oo + l * oStep, oo + (l + 1) * oStep, os);
		for (; l < count; l++) this.solve(y, yo + l * yStep, out, oo + l * oStep, os);
	}

	private solvePair(y: ArrayLike<number>, ya: number, yb: number, out: Float64Array, oa: number, ob: number, os: number): void {
		const N = this.n - 1;
		const { invH, wPrev, wHere, sub, inv, cp } = this;
		let pa = (y[ya + 1] - y[ya]) * invH[0];
		let pb = (y[yb + 1] - y[yb]) * invH[0];
		let ha = (y[ya + 2] - y[ya + 1]) * invH[1];
		let hb = (y[yb + 2] - y[yb + 1]) * invH[1];
		let sa = (wPrev[0] * pa + wHere[0] * ha) * inv[0];
		let sb = (wPrev[0] * pb + wHere[0] * hb) * inv[0];
		out[oa] = sa;
		out[ob] = sb;
		for (let i = 1; i < N; i++) {
			if (i > 1) {
				pa = ha;
				pb = hb;
				ha = (y[ya + i + 1] - y[ya + i]) * invH[i];
				hb = (y[yb + i + 1] - y[yb + i]) * invH[i];
			}
			sa = (wPrev[i] * pa + wHere[i] * ha - sub[i] * sa) * inv[i];
			sb = (wPrev[i] * pb + wHere[i] * hb - sub[i] * sb) * inv[i];
			out[oa + os * i] = sa;
			out[ob + os * i] = sb;
		}
		let na = (wPrev[N] * pa + wHere[N] * ha - sub[N] * sa) * inv[N];
		let nb = (wPrev[N] * pb + wHere[N] * hb - sub[N] * sb) * inv[N];
		out[oa + os * N] = na;
		out[ob + os * N] = nb;
		for (let i = N - 1, q = os * (N - 1); i >= 0; i--, q -= os) {
			na = out[oa + q] - cp[i] * na;
			nb = out[ob + q] - cp[i] * nb;
			out[oa + q] = na;
			out[ob + q] = nb;
		}
	}

	/**
	 * `count` lines swept side by side, in place in one array: line c's value i
	 * is data[base + c·lineStride + i·iStride + from] and its slope goes to the
	 * same place with `to` for `from`. Each step of the sweep takes every line
	 * once, so the lines' chains run independently (no waiting on one chain) and
	 * no line is copied out. The arithmetic is solve's, operation for operation,
	 * so the slopes are the same bits. Needs four knots or more (false
	 * otherwise: the caller takes solveLines).
	 */
	solveAcross(data: Float64Array, base: number, iStride: number, lineStride: number, count: number, from: number, to: number): boolean {
		const n = this.n;
		if (n <= 3) return false;
		const N = n - 1;
		const { invH, wPrev, wHere, sub, inv, cp } = this;
		const end = base + count * lineStride;
		{
			const i0 = invH[0];
			const i1 = invH[1];
			const a = wPrev[0];
			const b = wHere[0];
			const r = inv[0];
			for (let q = base; q < end; q += lineStride) {
				const y0 = data[q + from];
				const y1 = data[q + iStride + from];
				const y2 = data[q + 2 * iStride + from];
				data[q + to] = (a * ((y1 - y0) * i0) + b * ((y2 - y1) * i1)) * r;
			}
		}
		// row i (1 ≤ i ≤ N) uses m_{i−1} and m_i; row N's m_N does not exist: it uses m_{N−2}, m_{N−1}
		for (let i = 1; i <= N; i++) {
			const k = i < N ? i : N - 1;
			const il = invH[k - 1];
			const ir = invH[k];
			const a = wPrev[i];
			const b = wHere[i];
			const c = sub[i];
			const r = inv[i];
			const row = base + i * iStride;
			const yl0 = base + (k - 1) * iStride + from;
			for (let q = row, p = yl0; q < end + (row - base); q += lineStride, p += lineStride) {
				const yl = data[p];
				const yc = data[p + iStride];
				const yr = data[p + 2 * iStride];
				data[q + to] = (a * ((yc - yl) * il) + b * ((yr - yc) * ir) - c * data[q - iStride + to]) * r;
			}
		}
		for (let i = N - 1; i >= 0; i--) {
			const c = cp[i];
			const row = base + i * iStride + to;
			for (let q = row, stop = row + count * lineStride; q < stop; q += lineStride) data[q] = data[q] - c * data[q + iStride];
		}
		return true;
	}

	/** Writes the knot slopes of the values y[yo + i] to out[oo + os·i]. */
	solve(y: ArrayLike<number>, yo: number, out: Float64Array, oo: number, os = 1): void {
		const n = this.n;
		if (n <= 3) {
			const buf = this.small;
			cubicSplineSlopesInto(this.x, y, this.end, this.end, buf, 2, 0, 1, yo);
			for (let i = 0; i < n; i++) out[oo + os * i] = buf[2 * i];
			return;
		}
		const N = n - 1;
		const { invH, wPrev, wHere, sub, inv, cp } = this;
		let yl = y[yo];
		let yr = y[yo + 1];
		let mPrev = (yr - yl) * invH[0];
		yl = yr;
		yr = y[yo + 2];
		let mHere = (yr - yl) * invH[1];
		let sp = (wPrev[0] * mPrev + wHere[0] * mHere) * inv[0];
		out[oo] = sp;
		// row i uses m_{i−1} (mPrev) and m_i (mHere)
		for (let i = 1; i < N; i++) {
			if (i > 1) {
				mPrev = mHere;
				yl = yr;
				yr = y[yo + i + 1];
				mHere = (yr - yl) * invH[i];
			}
			sp = (wPrev[i] * mPrev + wHere[i] * mHere - sub[i] * sp) * inv[i];
			out[oo + os * i] = sp;
		}
		// row N: m_{N−2} is mPrev, m_{N−1} is mHere after the loop
		let next = (wPrev[N] * mPrev + wHere[N] * mHere - sub[N] * sp) * inv[N];
		out[oo + os * N] = next;
		for (let i = N - 1, q = oo + os * (N - 1); i >= 0; i--, q -= os) {
			next = out[q] - cp[i] * next;
			out[q] = next;
		}
	}
}
