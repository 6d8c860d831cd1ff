/**
 * The shared representation of every piecewise method: breakpoints ("knots")
 * and, per piece, the power-form coefficients of a polynomial of degree ≤ 3 in
 * the local coordinate s = x − knots[i]:
 *
 *     f(x) = c0 + c1·s + c2·s² + c3·s³      on [knots[i], knots[i+1]]
 *
 * stored piece after piece in one Float64Array (stride degree + 1). A cubic
 * spline on n points therefore keeps n knots + 4(n − 1) coefficients: five
 * doubles per knot. One routine returns f, f′ and f″ together (Horner), a
 * binary search finds the piece of a random point, and a monotone cursor
 * walks sorted batches in O(points + knots).
 *
 * A point exactly on an interior knot belongs to the piece on its right; the
 * last knot belongs to the last piece. So f′ and f″ at either end knot are the
 * limits from inside the data, never from the extrapolation.
 */
import { FitError } from './FitError';
import {
	FIT_FILE_FORMAT,
	FIT_FILE_VERSION,
	decodeArray,
	decodeNumber,
	decodeOptions,
	decodeStats,
	encodeArray,
	encodeNumber,
	encodeOptions,
	encodeStats,
	readFitFileHeader,
	type FitFileBase
} from './fitFile';
import type { Continuity, CurveFit, CurveFitOptions, CurveMethod, Extrapolation, FitStats, Jet } from './types';

export interface PiecewiseInit {
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

export function outsideError(x: number, domain: readonly [number, number]): FitError {
	return new FitError('outside-domain', `x = ${x} lies outside the data [${domain[0]}, ${domain[1]}] and the extrapolation rule is 'refuse'`);
}

export function invalidPoint(x: number): FitError {
	return new FitError('invalid-point', `cannot evaluate at x = ${x}`);
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
		if (Number.isNaN(x)) throw invalidPoint(x);
		const below = x < this.domain[0];
		switch (this.extrapolation) {
			case 'refuse':
				throw outsideError(x, this.domain);
			case 'hold':
				return { f: below ? this.f0 : this.fN, df: 0, d2f: 0, outside: true };
			case 'linear':
				return below
					? { f: this.f0 + this.d0 * (x - this.domain[0]), df: this.d0, d2f: 0, outside: true }
					: { f: this.fN + this.dN * (x - this.domain[1]), df: this.dN, d2f: 0, outside: true };
			default: {
				const j = this.evaluatePiece(below ? 0 : this.pieces - 1, x);
				j.outside = true;
				return j;
			}
		}
	}

	evaluateMany(xs: ArrayLike<number>, out?: ManyOut): ManyResult {
		const n = xs.length;
		const { f, df, d2f } = manyBuffers(n, out);
		const k = this.knots;
		const c = this.coefficients;
		const m = this.pieces;
		const last = m - 1;
		const lo = this.domain[0];
		const hi = this.domain[1];
		const deg = this.degree;
		// One cheap pass decides the search: sorted batches walk a cursor forward
		// (each knot and each point visited once), others binary-search.
		let sorted = true;
		for (let p = 1; p < n; p++) {
			if (!(xs[p] >= xs[p - 1])) {
				sorted = false;
				break;
			}
		}
		let outside = 0;
		let i = 0;
		for (let p = 0; p < n; p++) {
			const x = xs[p];
			if (!(x >= lo && x <= hi)) {
				const j = this.outsideJet(x);
				f[p] = j.f;
				df[p] = j.df;
				d2f[p] = j.d2f;
				outside++;
				continue;
			}
			if (sorted) {
				while (i < last && x >= k[i + 1]) i++;
			} else {
				let a = 0;
				let b = m;
				while (b - a > 1) {
					const mid = (a + b) >>> 1;
					if (x < k[mid]) b = mid;
					else a = mid;
				}
				i = a;
			}
			const s = x - k[i];
			if (deg === 3) {
				const o = i << 2;
				const c1 = c[o + 1];
				const c2 = c[o + 2];
				const c3 = c[o + 3];
				f[p] = c[o] + s * (c1 + s * (c2 + s * c3));
				df[p] = c1 + s * (2 * c2 + 3 * c3 * s);
				d2f[p] = 2 * c2 + 6 * c3 * s;
			} else if (deg === 1) {
				const o = i << 1;
				const c1 = c[o + 1];
				f[p] = c[o] + s * c1;
				df[p] = c1;
				d2f[p] = 0;
			} else {
				const o = 3 * i;
				const c1 = c[o + 1];
				const c2 = c[o + 2];
				f[p] = c[o] + s * (c1 + s * c2);
				df[p] = c1 + 2 * c2 * s;
				d2f[p] = 2 * c2;
			}
		}
		return { f, df, d2f, outside };
	}

	toJSON(): FitFileBase {
		return {
			format: FIT_FILE_FORMAT,
			version: FIT_FILE_VERSION,
			method: this.method,
			continuity: this.continuity,
			extrapolation: this.extrapolation,
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
 */
export function hermiteCoefficients(x: Float64Array, y: Float64Array, t: Float64Array): Float64Array {
	const m = x.length - 1;
	const c = new Float64Array(4 * m);
	for (let i = 0, o = 0; i < m; i++, o += 4) {
		const h = x[i + 1] - x[i];
		const slope = (y[i + 1] - y[i]) / h;
		const ti = t[i];
		const tau = (ti + t[i + 1] - 2 * slope) / h;
		c[o] = y[i];
		c[o + 1] = ti;
		c[o + 2] = (slope - ti) / h - tau;
		c[o + 3] = tau / h;
	}
	return c;
}
