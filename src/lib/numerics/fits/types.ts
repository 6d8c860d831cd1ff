/**
 * The contract every one-input fit meets. Plain TypeScript: no DOM, server or
 * framework imports anywhere under src/lib/numerics.
 */

export type Continuity = 'C0' | 'C1' | 'C2' | 'Cinf';

/** What happens when a point outside [domain[0], domain[1]] is asked for. */
export type Extrapolation = 'refuse' | 'hold' | 'linear' | 'extend';

export type CurveMethod =
	| 'linear'
	| 'cubic-natural'
	| 'cubic-not-a-knot'
	| 'cubic-clamped'
	| 'akima'
	| 'akima-modified'
	| 'pchip'
	| 'local-quadratic'
	| 'local-cubic'
	| 'polynomial-global'
	| 'polynomial-least-squares'
	| 'smoothing-spline'
	| 'softened-linear';

/** Value and derivatives at one point, computed together. */
export interface Jet {
	f: number;
	df: number;
	d2f: number;
	/** true when x lay outside the data and the extrapolation rule was applied */
	outside: boolean;
}

/**
 * Settings of a curve fit. Everything here is JSON-safe and is stored in the
 * fit file, so a fit can be rebuilt from the same data with the same result.
 */
export interface CurveFitOptions {
	/** what to do outside the data; default 'refuse' */
	extrapolation?: Extrapolation;
	/** repeated x values: 'error' (default) lists the rows; 'average' merges each group into its mean */
	duplicates?: 'error' | 'average';
	/** NaN / ±Infinity in x or y: 'error' (default) lists the rows; 'drop' leaves those rows out (noted) */
	nonFinite?: 'error' | 'drop';
	/** cubic-clamped: f′ at the first and the last x (required) */
	slopes?: readonly [number, number];
	/** polynomial-least-squares: degree (default 3) */
	degree?: number;
	/** smoothing-spline: fixed λ ≥ 0 in Σ w(y − f)² + λ∫f″²; omitted → chosen by GCV */
	lambda?: number;
	/** smoothing-spline, polynomial-least-squares: positive weight per input row (default 1) */
	weights?: readonly number[];
	/** softened-linear: width (x units) over which each kink is rounded; default half the smaller neighbouring spacing */
	width?: number;
}

/** Numbers a method reports about itself (all optional; present where defined). */
export interface FitStats {
	/** smoothing-spline: the λ used */
	lambda?: number;
	/** true when λ was chosen by generalised cross-validation */
	lambdaFromGcv?: boolean;
	/** effective degrees of freedom tr(A) of the linear smoother y ↦ f(x) */
	edf?: number;
	/** the GCV score n·RSS/(n − tr A)² at the λ used */
	gcv?: number;
	/** weighted residual sum of squares at the data */
	rss?: number;
	/** diagonal of the hat matrix A at the (cleaned, sorted) data; gives leave-one-out residuals in closed form */
	leverage?: Float64Array;
	/** polynomial degree where it is a single polynomial */
	degree?: number;
}

export interface CurveFit {
	readonly method: CurveMethod;
	readonly continuity: Continuity;
	readonly extrapolation: Extrapolation;
	readonly domain: readonly [number, number];
	/** abscissae where the piecewise representation changes piece (sorted); empty for C∞ global forms */
	readonly knots: Float64Array;
	/** value, f′ and f″ at x; throws FitError('outside-domain') under `refuse` */
	evaluate(x: number): Jet;
	/** batch evaluation; sorted xs take a monotone-cursor fast path */
	evaluateMany(xs: ArrayLike<number>, out?: { f?: Float64Array; df?: Float64Array; d2f?: Float64Array }): {
		f: Float64Array;
		df: Float64Array;
		d2f: Float64Array;
		outside: number;
	};
	/** values only (no derivatives), same search and extrapolation; `out` is reused when long enough */
	evaluateValues(xs: ArrayLike<number>, out?: Float64Array): Float64Array;
	/** the versioned fit-file body (exact round trip through fromJSON) */
	toJSON(): unknown;
	/** notes made while building (e.g. "x was unsorted; sorted") */
	readonly notes: readonly string[];
	/** the settings used (JSON-safe), defaults filled in */
	readonly options: Readonly<CurveFitOptions>;
	/** method-specific numbers (λ, tr A, leverage, …) */
	readonly stats: Readonly<FitStats>;
	/** number of polynomial pieces (1 for a single global form) */
	readonly pieces: number;
	/**
	 * Value and derivatives of one piece's own polynomial at x (no piece search,
	 * no extrapolation rule): the exact one-sided limits at a knot are
	 * evaluatePiece(k − 1, knots[k]) (left) and evaluatePiece(k, knots[k]) (right).
	 */
	evaluatePiece(piece: number, x: number): Jet;
}
