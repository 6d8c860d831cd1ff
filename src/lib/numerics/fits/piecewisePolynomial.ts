/**
 * The shared representation of every piecewise method: breakpoints ("knots")
 * and, per piece, the power-form coefficients of a polynomial of degree ≤ 3 in
 * the local coordinate s = x − knots[i]:
 *
 *     f(x) = c0 + c1·s + c2·s² + c3·s³      on [knots[i], knots[i+1]]
 *
 * stored piece after piece in one Float64Array (stride degree + 1). A cubic
 * spline on n points therefore keeps n knots + 4(n − 1) coefficients (the
 * builders leave four spare doubles at the end of the buffer): five doubles
 * per knot. One routine returns f, f′ and f″ together (Horner); a single
 * point finds its piece by bisection; batches keep a monotone cursor, so
 * sorted points walk the knots in O(points + knots), and points in random
 * order go through a bucket index built on first need (see buildIndex).
 *
 * A point exactly on an interior knot belongs to the piece on its right; the
 * last knot belongs to the last piece. So f′ and f″ at either end knot are the
 * limits from inside the data, never from the extrapolation.
 */
import { polynomialLimit } from '../math';
import { FitError } from './fitError';
import {
	decodeArray,
	decodeNumber,
	decodeOptions,
	decodeStats,
	encodeArray,
	encodeNumber,
	encodeOptions,
	encodeStats,
	fitFileEnvelope,
	readFitFileHeader,
	type FitFileBase
} from './fitFile';
import type { Continuity, CurveFit, CurveFitOptions, CurveMethod, Extrapolation, FitStats, Jet } from './types';

interface PiecewiseInit {
	method: CurveMethod;
	continuity: Continuity;
	options: CurveFitOptions;
	/** m + 1 strictly increasing breakpoints (kept, not copied) */
	knots: Float64Array;
	degree: 1 | 2 | 3;
	/** (degree + 1)·m coefficients (kept, not copied) */
	coefficients: Float64Array;
	notes?: string[];
	stats?: FitStats;
}

export interface ManyResult {
	f: Float64Array;
	df: Float64Array;
	d2f: Float64Array;
	outside: number;
}

export type ManyOut = { f?: Float64Array; df?: Float64Array; d2f?: Float64Array };

/** Output arrays for a batch of n points: the caller's when long enough, else fresh. */
export function manyBuffers(n: number, out?: ManyOut): { f: Float64Array; df: Float64Array; d2f: Float64Array } {
	return {
		f: out?.f && out.f.length >= n ? out.f : new Float64Array(n),
		df: out?.df && out.df.length >= n ? out.df : new Float64Array(n),
		d2f: out?.d2f && out.d2f.length >= n ? out.d2f : new Float64Array(n)
	};
}

/**
 * `hold` and `linear` beyond the data from the edge value and slope (shared by
 * every curve fit); null for `extend`, which each fit evaluates its own way.
 * Throws for `refuse` and NaN.
 */
export function edgeExtrapolation(x: number, rule: Extrapolation, domain: readonly [number, number], edge: (below: boolean) => { f: number; df: number }): Jet | null {
	if (Number.isNaN(x)) throw invalidPoint(x);
	const below = x < domain[0];
	if (rule === 'refuse') throw outsideError(x, domain);
	if (rule === 'extend') return null;
	const e = edge(below);
	if (rule === 'hold') return { f: e.f, df: 0, d2f: 0, outside: true };
	// a zero edge slope keeps f at the edge value, also at ±∞ (where 0·∞ would be NaN)
	const xe = domain[below ? 0 : 1];
	return { f: e.df === 0 ? e.f : e.f + e.df * (x - xe), df: e.df, d2f: 0, outside: true };
}

/** evaluateMany for a fit evaluated one point at a time (the piecewise fits have batch kernels instead). */
export function evaluateManyPointwise(evaluate: (x: number) => Jet, xs: ArrayLike<number>, out?: ManyOut): ManyResult {
	const n = xs.length;
	const { f, df, d2f } = manyBuffers(n, out);
	let outside = 0;
	for (let p = 0; p < n; p++) {
		const j = evaluate(xs[p]);
		f[p] = j.f;
		df[p] = j.df;
		d2f[p] = j.d2f;
		if (j.outside) outside++;
	}
	return { f, df, d2f, outside };
}

/** evaluateValues for a fit evaluated one point at a time; `out` is reused when long enough. */
export function evaluateValuesPointwise(evaluate: (x: number) => Jet, xs: ArrayLike<number>, out?: Float64Array): Float64Array {
	const f = out && out.length >= xs.length ? out : new Float64Array(xs.length);
	for (let p = 0; p < xs.length; p++) f[p] = evaluate(xs[p]).f;
	return f;
}

export function outsideError(x: number, domain: readonly [number, number]): FitError {
	return new FitError('outside-domain', `x = ${x} lies outside the data [${domain[0]}, ${domain[1]}] and the extrapolation rule is 'refuse'`);
}

export function invalidPoint(x: number): FitError {
	return new FitError('invalid-point', `cannot evaluate at x = ${x}`);
}

interface BucketIndex {
	start: Int32Array;
	inv: number;
	last: number;
	lo: number;
}

/**
 * The piece of x when it lies at most eight pieces to the right of piece i
 * (−1 otherwise): sorted batches step through the knots sequentially, which
 * beats any search when points and knots are about equally dense.
 */
function walkForward(k: Float64Array, m: number, i: number, x: number): number {
	if (!(x >= k[i])) return -1;
	const last = m - 1;
	for (let step = 0; step < 8; step++) {
		if (i === last || x < k[i + 1]) return i;
		i++;
	}
	return i === last || x < k[i + 1] ? i : -1;
}

/**
 * Piece of x (inside the domain) through the bucket index: the bucket of x,
 * then bisection between the pieces at its two edges. Bucket edges are
 * rounded, so a point on the wrong side of one falls back to full bisection.
 */
function locateIn(ix: BucketIndex, k: Float64Array, m: number, x: number): number {
	let b = ((x - ix.lo) * ix.inv) | 0;
	if (b > ix.last) b = ix.last;
	let a = ix.start[b];
	let e = ix.start[b + 1] + 1;
	if (e > m) e = m;
	while (e - a > 1) {
		const mid = (a + e) >>> 1;
		if (x < k[mid]) e = mid;
		else a = mid;
	}
	if (x >= k[a] && (a === m - 1 || x < k[a + 1])) return a;
	let lo = 0;
	let hi = m;
	while (hi - lo > 1) {
		const mid = (lo + hi) >>> 1;
		if (x < k[mid]) hi = mid;
		else lo = mid;
	}
	return lo;
}

/** The smallest double above v (v finite). */
function nextUp(v: number): number {
	if (v === 0) return Number.MIN_VALUE;
	const buf = new Float64Array([v]);
	const bits = new BigInt64Array(buf.buffer);
	bits[0] += v > 0 ? 1n : -1n;
	return buf[0];
}

export class PiecewisePolynomial implements CurveFit {
	readonly method: CurveMethod;
	readonly continuity: Continuity;
	readonly extrapolation: Extrapolation;
	readonly domain: readonly [number, number];
	readonly knots: Float64Array;
	readonly coefficients: Float64Array;
	readonly degree: 1 | 2 | 3;
	readonly pieces: number;
	readonly notes: readonly string[];
	readonly options: Readonly<CurveFitOptions>;
	readonly stats: Readonly<FitStats>;
	// value and slope at the two ends (limits from inside) for 'hold' and 'linear'
	private readonly f0: number;
	private readonly d0: number;
	private readonly fN: number;
	private readonly dN: number;
	// the double just above the domain's end: the last piece's exclusive right end in the kernels
	private readonly rightEdge: number;

	constructor(init: PiecewiseInit) {
		const m = init.knots.length - 1;
		if (m < 1) throw new FitError('too-few-points', 'a piecewise polynomial needs at least two knots');
		if (init.coefficients.length !== (init.degree + 1) * m) {
			throw new FitError('bad-fit-file', `expected ${(init.degree + 1) * m} coefficients for ${m} pieces of degree ${init.degree}`);
		}
		this.method = init.method;
		this.continuity = init.continuity;
		this.options = Object.freeze({ ...init.options, extrapolation: init.options.extrapolation ?? 'refuse' });
		this.extrapolation = this.options.extrapolation!;
		this.knots = init.knots;
		this.coefficients = init.coefficients;
		this.degree = init.degree;
		this.pieces = m;
		this.domain = Object.freeze([init.knots[0], init.knots[m]] as const);
		this.notes = Object.freeze([...(init.notes ?? [])]);
		this.stats = Object.freeze({ ...(init.stats ?? {}) });
		const left = this.evaluatePiece(0, this.domain[0]);
		const right = this.evaluatePiece(m - 1, this.domain[1]);
		this.rightEdge = nextUp(this.domain[1]);
		this.f0 = left.f;
		this.d0 = left.df;
		this.fN = right.f;
		this.dN = right.df;
	}

	evaluatePiece(piece: number, x: number): Jet {
		const i = Math.min(Math.max(piece | 0, 0), this.pieces - 1);
		const c = this.coefficients;
		const s = x - this.knots[i];
		switch (this.degree) {
			case 3: {
				const o = 4 * i;
				const c1 = c[o + 1];
				const c2 = c[o + 2];
				const c3 = c[o + 3];
				return { f: c[o] + s * (c1 + s * (c2 + s * c3)), df: c1 + s * (2 * c2 + 3 * c3 * s), d2f: 2 * c2 + 6 * c3 * s, outside: false };
			}
			case 2: {
				const o = 3 * i;
				const c1 = c[o + 1];
				const c2 = c[o + 2];
				return { f: c[o] + s * (c1 + s * c2), df: c1 + 2 * c2 * s, d2f: 2 * c2, outside: false };
			}
			default: {
				const o = 2 * i;
				return { f: c[o] + s * c[o + 1], df: c[o + 1], d2f: 0, outside: false };
			}
		}
	}

	/** index of the piece holding x (x inside the domain) */
	findPiece(x: number): number {
		const k = this.knots;
		let lo = 0;
		let hi = this.pieces;
		while (hi - lo > 1) {
			const mid = (lo + hi) >>> 1;
			if (x < k[mid]) hi = mid;
			else lo = mid;
		}
		return lo;
	}

	evaluate(x: number): Jet {
		if (x >= this.domain[0] && x <= this.domain[1]) return this.evaluatePiece(this.findPiece(x), x);
		return this.outsideJet(x);
	}

	private outsideJet(x: number): Jet {
		const edge = edgeExtrapolation(x, this.extrapolation, this.domain, (below) => (below ? { f: this.f0, df: this.d0 } : { f: this.fN, df: this.dN }));
		if (edge) return edge;
		const below = x < this.domain[0];
		if (!Number.isFinite(x)) return this.edgeAtInfinity(below);
		const j = this.evaluatePiece(below ? 0 : this.pieces - 1, x);
		j.outside = true;
		return j;
	}

	/**
	 * `extend` at x = ±∞: the limits of the edge piece and its derivatives,
	 * led by the highest non-zero coefficient (a constant stays a constant,
	 * where Horner's rule would form 0·∞ = NaN).
	 */
	private edgeAtInfinity(below: boolean): Jet {
		const i = below ? 0 : this.pieces - 1;
		const d = this.degree;
		const c = Array.from(this.coefficients.subarray((d + 1) * i, (d + 1) * (i + 1)));
		const sign = below ? -1 : 1;
		const d1 = c.slice(1).map((v, k) => (k + 1) * v);
		const d2 = d1.slice(1).map((v, k) => (k + 1) * v);
		return { f: polynomialLimit(c, sign), df: polynomialLimit(d1, sign), d2f: polynomialLimit(d2, sign), outside: true };
	}

	evaluateMany(xs: ArrayLike<number>, out?: ManyOut): ManyResult {
		const n = xs.length;
		const { f, df, d2f } = manyBuffers(n, out);
		const outside = this.batch(xs, f, df, d2f, true);
		return { f, df, d2f, outside };
	}

	/** Values only (no derivatives), same search; `out` is reused when long enough. */
	evaluateValues(xs: ArrayLike<number>, out?: Float64Array): Float64Array {
		const f = out && out.length >= xs.length ? out : new Float64Array(xs.length);
		this.batch(xs, f, f, f, false);
		return f;
	}

	/**
	 * The batch kernels. Each point first tests the piece of the previous point
	 * (its left and right ends and its coefficients are held in locals), then
	 * walks up to eight pieces forward, so a sorted batch runs through the knots
	 * like a cursor, O(points + knots) in all. Any other point is located
	 * through the bucket index (built once 32 points in a batch have needed a
	 * search), or by bisection before that. The right end of the last piece is
	 * the double just above the domain's end, so every point that passes the
	 * two comparisons is inside the data; the rest (outside, NaN) take the
	 * extrapolation rule. One loop per degree and output kind keeps the
	 * common loops free of branches that do not concern them.
	 * Why the near-copies below stay: these loops are the speed-critical
	 * evaluation kernels (npm run bench:fits); one shared loop with a degree
	 * or output switch would put that branch back into every point.
	 */
	private batch(xs: ArrayLike<number>, f: Float64Array, df: Float64Array, d2f: Float64Array, full: boolean): number {
		this.seekMisses = 0;
		if (this.degree === 3) return full ? this.batch3(xs, f, df, d2f) : this.values3(xs, f);
		if (this.degree === 1) return full ? this.batch1(xs, f, df, d2f) : this.values1(xs, f);
		return this.batch2(xs, f, df, d2f, full);
	}

	private outsideInto(x: number, p: number, f: Float64Array, df: Float64Array | null, d2f: Float64Array | null): void {
		const j = this.outsideJet(x);
		f[p] = j.f;
		if (df) df[p] = j.df;
		if (d2f) d2f[p] = j.d2f;
	}

	/** The bucket index once it pays for itself: after 32 bisections in one batch. */
	private indexFor(): BucketIndex | null {
		if (this.index) return this.index;
		return ++this.seekMisses > 32 ? this.buildIndex() : null;
	}

	private seekMisses = 0;

	/** right end used by the kernels: the next knot, or just above the domain for the last piece */
	private rightOf(i: number): number {
		return i < this.pieces - 1 ? this.knots[i + 1] : this.rightEdge;
	}

	private batch3(xs: ArrayLike<number>, f: Float64Array, df: Float64Array, d2f: Float64Array): number {
		const n = xs.length;
		const k = this.knots;
		const c = this.coefficients;
		const m = this.pieces;
		let ix = this.index;
		let outside = 0;
		let i = 0;
		let left = k[0];
		let right = this.rightOf(0);
		let c0 = c[0];
		let c1 = c[1];
		let c2 = c[2];
		let c3 = c[3];
		for (let p = 0; p < n; p++) {
			const x = xs[p];
			if (!(x >= left && x < right)) {
				if (!(x >= this.domain[0] && x <= this.domain[1])) {
					this.outsideInto(x, p, f, df, d2f);
					outside++;
					continue;
				}
				const j = walkForward(k, m, i, x);
				if (j >= 0) i = j;
				else {
					if (ix === null) ix = this.indexFor();
					i = ix === null ? this.findPiece(x) : locateIn(ix, k, m, x);
				}
				left = k[i];
				right = this.rightOf(i);
				const o = i << 2;
				c0 = c[o];
				c1 = c[o + 1];
				c2 = c[o + 2];
				c3 = c[o + 3];
			}
			const s = x - left;
			f[p] = c0 + s * (c1 + s * (c2 + s * c3));
			df[p] = c1 + s * (2 * c2 + 3 * c3 * s);
			d2f[p] = 2 * c2 + 6 * c3 * s;
		}
		return outside;
	}

	private values3(xs: ArrayLike<number>, f: Float64Array): number {
		const n = xs.length;
		const k = this.knots;
		const c = this.coefficients;
		const m = this.pieces;
		let ix = this.index;
		let outside = 0;
		let i = 0;
		let left = k[0];
		let right = this.rightOf(0);
		let c0 = c[0];
		let c1 = c[1];
		let c2 = c[2];
		let c3 = c[3];
		for (let p = 0; p < n; p++) {
			const x = xs[p];
			if (!(x >= left && x < right)) {
				if (!(x >= this.domain[0] && x <= this.domain[1])) {
					this.outsideInto(x, p, f, null, null);
					outside++;
					continue;
				}
				const j = walkForward(k, m, i, x);
				if (j >= 0) i = j;
				else {
					if (ix === null) ix = this.indexFor();
					i = ix === null ? this.findPiece(x) : locateIn(ix, k, m, x);
				}
				left = k[i];
				right = this.rightOf(i);
				const o = i << 2;
				c0 = c[o];
				c1 = c[o + 1];
				c2 = c[o + 2];
				c3 = c[o + 3];
			}
			const s = x - left;
			f[p] = c0 + s * (c1 + s * (c2 + s * c3));
		}
		return outside;
	}

	private batch1(xs: ArrayLike<number>, f: Float64Array, df: Float64Array, d2f: Float64Array): number {
		const n = xs.length;
		const k = this.knots;
		const c = this.coefficients;
		const m = this.pieces;
		let ix = this.index;
		let outside = 0;
		let i = 0;
		let left = k[0];
		let right = this.rightOf(0);
		let c0 = c[0];
		let c1 = c[1];
		for (let p = 0; p < n; p++) {
			const x = xs[p];
			if (!(x >= left && x < right)) {
				if (!(x >= this.domain[0] && x <= this.domain[1])) {
					this.outsideInto(x, p, f, df, d2f);
					outside++;
					continue;
				}
				const j = walkForward(k, m, i, x);
				if (j >= 0) i = j;
				else {
					if (ix === null) ix = this.indexFor();
					i = ix === null ? this.findPiece(x) : locateIn(ix, k, m, x);
				}
				left = k[i];
				right = this.rightOf(i);
				c0 = c[i << 1];
				c1 = c[(i << 1) + 1];
			}
			f[p] = c0 + (x - left) * c1;
			df[p] = c1;
			d2f[p] = 0;
		}
		return outside;
	}

	private values1(xs: ArrayLike<number>, f: Float64Array): number {
		const n = xs.length;
		const k = this.knots;
		const c = this.coefficients;
		const m = this.pieces;
		let ix = this.index;
		let outside = 0;
		let i = 0;
		let left = k[0];
		let right = this.rightOf(0);
		let c0 = c[0];
		let c1 = c[1];
		for (let p = 0; p < n; p++) {
			const x = xs[p];
			if (!(x >= left && x < right)) {
				if (!(x >= this.domain[0] && x <= this.domain[1])) {
					this.outsideInto(x, p, f, null, null);
					outside++;
					continue;
				}
				const j = walkForward(k, m, i, x);
				if (j >= 0) i = j;
				else {
					if (ix === null) ix = this.indexFor();
					i = ix === null ? this.findPiece(x) : locateIn(ix, k, m, x);
				}
				left = k[i];
				right = this.rightOf(i);
				c0 = c[i << 1];
				c1 = c[(i << 1) + 1];
			}
			f[p] = c0 + (x - left) * c1;
		}
		return outside;
	}

	private batch2(xs: ArrayLike<number>, f: Float64Array, df: Float64Array, d2f: Float64Array, full: boolean): number {
		const n = xs.length;
		const k = this.knots;
		const c = this.coefficients;
		const m = this.pieces;
		let ix = this.index;
		let outside = 0;
		let i = 0;
		let left = k[0];
		let right = this.rightOf(0);
		let c0 = c[0];
		let c1 = c[1];
		let c2 = c[2];
		for (let p = 0; p < n; p++) {
			const x = xs[p];
			if (!(x >= left && x < right)) {
				if (!(x >= this.domain[0] && x <= this.domain[1])) {
					this.outsideInto(x, p, f, full ? df : null, full ? d2f : null);
					outside++;
					continue;
				}
				const j = walkForward(k, m, i, x);
				if (j >= 0) i = j;
				else {
					if (ix === null) ix = this.indexFor();
					i = ix === null ? this.findPiece(x) : locateIn(ix, k, m, x);
				}
				left = k[i];
				right = this.rightOf(i);
				const o = 3 * i;
				c0 = c[o];
				c1 = c[o + 1];
				c2 = c[o + 2];
			}
			const s = x - left;
			f[p] = c0 + s * (c1 + s * c2);
			if (full) {
				df[p] = c1 + 2 * c2 * s;
				d2f[p] = 2 * c2;
			}
		}
		return outside;
	}

	/**
	 * Search index for points in random order, built on first need and never
	 * serialised: the domain is cut into equal buckets (about one per piece),
	 * and start[b] is the piece holding the left end of bucket b. A point's
	 * piece then lies between start[b] and start[b + 1], usually within a piece
	 * or two, so a lookup costs one multiply and a step or two of bisection
	 * instead of log2(pieces) steps with a cache miss each. Costs one 32-bit
	 * integer per bucket (see the bucket count below).
	 */
	private index: BucketIndex | null = null;

	/** bytes held by the random-order search index (0 until a batch has needed it) */
	get searchIndexBytes(): number {
		return this.index ? this.index.start.byteLength : 0;
	}

	private buildIndex(): BucketIndex {
		const k = this.knots;
		const m = this.pieces;
		const lo = this.domain[0];
		// One bucket per piece while the index is small (≤ 256 KiB, cache-resident); beyond
		// that one per four pieces: for large fits the lookup is bound by cache misses on
		// the knots and coefficients, so a coarser index is as fast and costs an eighth of
		// a double per knot instead of half.
		const nb = Math.max(1, Math.min(m, Math.max(Math.ceil(m / 4), 65536)));
		const inv = nb / (this.domain[1] - lo);
		const start = new Int32Array(nb + 1);
		let i = 0;
		for (let b = 0; b <= nb; b++) {
			const xb = lo + b / inv;
			while (i < m - 1 && k[i + 1] <= xb) i++;
			start[b] = i;
		}
		this.index = { start, inv, last: nb - 1, lo };
		return this.index;
	}

	toJSON(): FitFileBase {
		return {
			...fitFileEnvelope(this),
			domain: [encodeNumber(this.domain[0]), encodeNumber(this.domain[1])],
			options: encodeOptions(this.options),
			representation: 'piecewise-polynomial',
			knots: encodeArray(this.knots),
			degree: this.degree,
			coefficients: encodeArray(this.coefficients),
			stats: encodeStats(this.stats),
			notes: [...this.notes]
		};
	}

	static fromJSON(json: unknown): PiecewisePolynomial {
		const h = readFitFileHeader(json);
		if (h.representation !== 'piecewise-polynomial') throw new FitError('bad-fit-file', 'fit file: not a piecewise polynomial');
		const degree = h.degree;
		if (degree !== 1 && degree !== 2 && degree !== 3) throw new FitError('bad-fit-file', 'fit file: degree must be 1, 2 or 3');
		const knots = decodeArray(h.knots, 'knots');
		for (let i = 1; i < knots.length; i++) {
			if (!(knots[i] > knots[i - 1])) throw new FitError('bad-fit-file', 'fit file: knots must increase');
		}
		const fit = new PiecewisePolynomial({
			method: h.method,
			continuity: h.continuity,
			options: { ...decodeOptions(h.options), extrapolation: h.extrapolation },
			knots,
			degree,
			coefficients: decodeArray(h.coefficients, 'coefficients'),
			notes: h.notes.map(String),
			stats: decodeStats(h.stats)
		});
		const d0 = decodeNumber(h.domain[0], 'domain[0]');
		const d1 = decodeNumber(h.domain[1], 'domain[1]');
		if (!Object.is(d0, fit.domain[0]) || !Object.is(d1, fit.domain[1])) throw new FitError('bad-fit-file', 'fit file: domain does not match the knots');
		return fit;
	}
}

/**
 * Cubic Hermite pieces from values y and slopes t at the knots x:
 * on [x_i, x_{i+1}] with h = x_{i+1} − x_i and secant m,
 *   c0 = y_i, c1 = t_i, c2 = (m − t_i)/h − τ, c3 = τ/h, with τ = (t_i + t_{i+1} − 2m)/h.
 * The operations are in the order SciPy's CubicHermiteSpline uses, so shared
 * slopes give coefficients that agree to the last bit or two.
 *
 * In place: `buf` has 4n entries and holds t_i at buf[4i + 1] for every knot
 * (the last slope in the spare fifth-from-last slot); each piece's other three
 * entries are scratch for the slope solvers until this pass overwrites them.
 * Returns the 4(n − 1) coefficients as a view of `buf` — so a cubic keeps
 * n knots + 4n doubles, and the build allocates nothing else.
 */
export function hermiteInPlace(x: Float64Array, y: ArrayLike<number>, buf: Float64Array): Float64Array {
	const m = x.length - 1;
	let xi = x[0];
	let yi = y[0];
	let ti = buf[1];
	for (let i = 0, o = 0; i < m; i++, o += 4) {
		const xn = x[i + 1];
		const yn = y[i + 1];
		const tn = buf[o + 5];
		const h = xn - xi;
		const slope = (yn - yi) / h;
		const tau = (ti + tn - 2 * slope) / h;
		buf[o] = yi;
		buf[o + 2] = (slope - ti) / h - tau;
		buf[o + 3] = tau / h;
		xi = xn;
		yi = yn;
		ti = tn;
	}
	return buf.subarray(0, 4 * m);
}

/** Hermite coefficients from a separate slope array (allocates; see hermiteInPlace). */
export function hermiteCoefficients(x: Float64Array, y: ArrayLike<number>, t: ArrayLike<number>): Float64Array {
	const buf = new Float64Array(4 * x.length);
	for (let i = 0; i < x.length; i++) buf[4 * i + 1] = t[i];
	return hermiteInPlace(x, y, buf);
}
