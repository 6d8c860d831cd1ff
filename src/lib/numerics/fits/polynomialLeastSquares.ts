/**
 * Least-squares polynomial of a chosen degree d, solved by Householder QR:
 * G. H. Golub, 1965, "Numerical methods for solving linear least squares
 * problems", Numer. Math. 7:206–216.
 *
 * The design matrix is the Vandermonde matrix in t = (x − c)/s with c the
 * middle and s the half-width of the data, so t ∈ [−1, 1]: on raw x (say
 * 300…600 K) the columns x^k are nearly parallel and the condition number
 * explodes; centring and scaling keeps it modest for the degrees used in
 * practice. QR is applied to that matrix directly — never the normal
 * equations XᵀX, whose condition number is the square of X's. Weights w scale
 * the rows by √w. The hat-matrix diagonal h_ii = ‖row i of Q‖² gives exact
 * leave-one-out residuals e_i/(1 − h_ii).
 */
import { Matrix, QrDecomposition } from 'ml-matrix';
import { polynomialLimit } from '../math';
import { FitError } from './fitError';
import { decodeArray, decodeNumber, decodeOptions, decodeStats, encodeArray, encodeNumber, encodeOptions, encodeStats, fitFileEnvelope, readFitFileHeader, type FitFileBase } from './fitFile';
import { edgeExtrapolation, evaluateManyPointwise, evaluateValuesPointwise, type ManyOut, type ManyResult } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { Continuity, CurveFit, CurveFitOptions, CurveMethod, Extrapolation, FitStats, Jet } from './types';

/** One polynomial Σ a_k t^k in t = (x − center)/scale, valid on `domain`. */
export class ScaledPolynomial implements CurveFit {
	readonly method: CurveMethod = 'polynomial-least-squares';
	readonly continuity: Continuity = 'Cinf';
	readonly extrapolation: Extrapolation;
	readonly domain: readonly [number, number];
	readonly knots = new Float64Array(0);
	readonly pieces = 1;
	readonly notes: readonly string[];
	readonly options: Readonly<CurveFitOptions>;
	readonly stats: Readonly<FitStats>;
	readonly center: number;
	readonly scale: number;
	/** ascending powers of t */
	readonly coefficients: Float64Array;
	private readonly edges: [Jet, Jet];

	constructor(init: {
		options: CurveFitOptions;
		domain: readonly [number, number];
		center: number;
		scale: number;
		coefficients: Float64Array;
		notes?: string[];
		stats?: FitStats;
	}) {
		if (init.coefficients.length < 1) throw new FitError('bad-fit-file', 'polynomial: no coefficients');
		if (!(init.domain[1] > init.domain[0]) || !(init.scale > 0)) throw new FitError('bad-fit-file', 'polynomial: bad domain or scale');
		this.options = Object.freeze({ ...init.options, extrapolation: init.options.extrapolation ?? 'refuse' });
		this.extrapolation = this.options.extrapolation!;
		this.domain = Object.freeze([init.domain[0], init.domain[1]] as const);
		this.center = init.center;
		this.scale = init.scale;
		this.coefficients = init.coefficients;
		this.notes = Object.freeze([...(init.notes ?? [])]);
		this.stats = Object.freeze({ ...(init.stats ?? {}), degree: init.coefficients.length - 1 });
		this.edges = [this.evaluatePiece(0, this.domain[0]), this.evaluatePiece(0, this.domain[1])];
	}

	/** The polynomial at any x (no extrapolation rule): Horner with two derivative accumulators. */
	evaluatePiece(_piece: number, x: number): Jet {
		const a = this.coefficients;
		const t = (x - this.center) / this.scale;
		let p = a[a.length - 1];
		let p1 = 0;
		let p2 = 0; // p″/2
		for (let k = a.length - 2; k >= 0; k--) {
			p2 = p2 * t + p1;
			p1 = p1 * t + p;
			p = p * t + a[k];
		}
		const s = this.scale;
		return { f: p, df: p1 / s, d2f: (2 * p2) / (s * s), outside: false };
	}

	evaluate(x: number): Jet {
		if (x >= this.domain[0] && x <= this.domain[1]) return this.evaluatePiece(0, x);
		const edge = edgeExtrapolation(x, this.extrapolation, this.domain, (below) => this.edges[below ? 0 : 1]);
		if (edge) return edge;
		if (!Number.isFinite(x)) {
			// the limits at ±∞ (t → ±∞ with x, the scale being positive)
			const a = Array.from(this.coefficients);
			const sign = x < 0 ? -1 : 1;
			const d1 = a.slice(1).map((v, k) => ((k + 1) * v) / this.scale);
			const d2 = d1.slice(1).map((v, k) => ((k + 1) * v) / this.scale);
			return { f: polynomialLimit(a, sign), df: polynomialLimit(d1, sign), d2f: polynomialLimit(d2, sign), outside: true };
		}
		const j = this.evaluatePiece(0, x);
		j.outside = true;
		return j;
	}

	evaluateMany(xs: ArrayLike<number>, out?: ManyOut): ManyResult {
		return evaluateManyPointwise((x) => this.evaluate(x), xs, out);
	}

	evaluateValues(xs: ArrayLike<number>, out?: Float64Array): Float64Array {
		return evaluateValuesPointwise((x) => this.evaluate(x), xs, out);
	}

	toJSON(): FitFileBase {
		return {
			...fitFileEnvelope(this),
			domain: [encodeNumber(this.domain[0]), encodeNumber(this.domain[1])],
			options: encodeOptions(this.options),
			representation: 'polynomial',
			knots: [],
			center: encodeNumber(this.center),
			scale: encodeNumber(this.scale),
			coefficients: encodeArray(this.coefficients),
			stats: encodeStats(this.stats),
			notes: [...this.notes]
		};
	}

	static fromJSON(json: unknown): ScaledPolynomial {
		const h = readFitFileHeader(json);
		if (h.representation !== 'polynomial') throw new FitError('bad-fit-file', 'fit file: not a polynomial');
		return new ScaledPolynomial({
			options: { ...decodeOptions(h.options), extrapolation: h.extrapolation },
			domain: [decodeNumber(h.domain[0], 'domain[0]'), decodeNumber(h.domain[1], 'domain[1]')],
			center: decodeNumber(h.center, 'center'),
			scale: decodeNumber(h.scale, 'scale'),
			coefficients: decodeArray(h.coefficients, 'coefficients'),
			notes: h.notes.map(String),
			stats: decodeStats(h.stats)
		});
	}
}

export function polynomialLeastSquares(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): ScaledPolynomial {
	const opts = resolveOptions(options, 'polynomial-least-squares');
	const notes: string[] = [];
	if (opts.degree === undefined) {
		opts.degree = 3;
		notes.push('degree not given; used 3');
	}
	const deg = opts.degree;
	if (!Number.isInteger(deg) || deg < 0) throw new FitError('bad-option', 'polynomial-least-squares: degree must be a whole number ≥ 0');
	const d = prepareData(x, y, opts, {
		label: 'polynomial-least-squares',
		minPoints: 2,
		minReason: 'the domain needs two distinct x',
		acceptsWeights: true
	});
	const n = d.x.length;
	if (deg >= n) {
		throw new FitError(
			'degree-too-high',
			`polynomial-least-squares: degree ${deg} needs at least ${deg + 1} distinct points; got ${n} (degree must be below the number of points)`
		);
	}
	const xs = d.x;
	// Solve for y − m, m the middle of y's range, and add m to the constant term
	// afterwards (exact in exact arithmetic, the constant column is in the
	// model): a large offset in y (absolute pressures, energies) would otherwise
	// enter every Householder reflection and cost the slope coefficients the
	// offset's rounding; y − m is exact for values near m (Sterbenz's lemma).
	let yMin = Infinity;
	let yMax = -Infinity;
	for (let i = 0; i < n; i++) {
		if (d.y[i] < yMin) yMin = d.y[i];
		if (d.y[i] > yMax) yMax = d.y[i];
	}
	const yMid = 0.5 * yMin + 0.5 * yMax;
	const center = 0.5 * (xs[0] + xs[n - 1]);
	const scale = 0.5 * (xs[n - 1] - xs[0]);
	const X = new Matrix(n, deg + 1);
	const b = new Matrix(n, 1);
	for (let i = 0; i < n; i++) {
		const t = (xs[i] - center) / scale;
		const r = d.w ? Math.sqrt(d.w[i]) : 1;
		let p = r;
		for (let k = 0; k <= deg; k++) {
			X.set(i, k, p);
			p *= t;
		}
		b.set(i, 0, r * (d.y[i] - yMid));
	}
	const qr = new QrDecomposition(X);
	if (!qr.isFullRank()) throw new FitError('singular', `polynomial-least-squares: the degree-${deg} design matrix is rank deficient`);
	const beta = qr.solve(b);
	const coefficients = new Float64Array(deg + 1);
	for (let k = 0; k <= deg; k++) coefficients[k] = beta.get(k, 0);
	coefficients[0] += yMid;
	// Leverage: squared row norms of the thin Q.
	const Q = qr.orthogonalMatrix;
	const leverage = new Float64Array(n);
	let rss = 0;
	for (let i = 0; i < n; i++) {
		let s = 0;
		for (let k = 0; k <= deg; k++) s += Q.get(i, k) ** 2;
		leverage[i] = s;
	}
	const init = {
		options: opts,
		domain: [xs[0], xs[n - 1]] as const,
		center,
		scale,
		coefficients,
		notes: [...d.notes, ...notes]
	};
	const trial = new ScaledPolynomial(init);
	for (let i = 0; i < n; i++) {
		const e = d.y[i] - trial.evaluatePiece(0, xs[i]).f;
		rss += (d.w ? d.w[i] : 1) * e * e;
	}
	const fit = new ScaledPolynomial({ ...init, stats: { degree: deg, leverage, edf: deg + 1, rss } });
	return fit;
}
