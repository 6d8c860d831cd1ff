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
	/** the versioned fit-file body (exact round trip through fromJSON) */
	toJSON(): unknown;
	/** notes made while building (e.g. "x was unsorted; sorted") */
	readonly notes: readonly string[];
}
