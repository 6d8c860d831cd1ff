/**
 * The global interpolating polynomial, in barycentric Lagrange form:
 * J.-P. Berrut, L. N. Trefethen, 2004, "Barycentric Lagrange Interpolation",
 * SIAM Review 46(3):501–517. With weights w_j = 1/Π_{k≠j}(x_j − x_k),
 *     p(x) = Σ_j [w_j/(x − x_j)]·y_j / Σ_j w_j/(x − x_j),
 * which is O(n) per point. Its stability depends on the nodes (N. J. Higham,
 * 2004, "The numerical stability of barycentric Lagrange interpolation", IMA
 * J. Numer. Anal. 24:547–556): this "second" form is forward stable when the
 * nodes' Lebesgue constant is small (Chebyshev-like points), and loses
 * accuracy in proportion to it otherwise. Table data are usually equispaced
 * or clustered, where the Lebesgue constant grows exponentially with n: the
 * rounding error then grows as fast as the ringing does, which is one more
 * reason this method is meant for a handful of points (a note says so beyond
 * 20, and the app refuses it beyond 40).
 *
 * Derivatives. p′ and p″ are polynomials of degree < n, so the same formula
 * with the same weights reproduces them exactly from their values at the
 * nodes. Those nodal values come from the differentiation matrices of
 * C. Schneider, W. Werner, 1986, "Some new aspects of rational interpolation",
 * Math. Comp. 47:285–299 (Berrut & Trefethen §9):
 *     D_kj = (w_j/w_k)/(x_k − x_j),  D2_kj = 2·D_kj·(D_kk − 1/(x_k − x_j))  (j ≠ k),
 * with the diagonals fixed by "rows sum to zero" (constants have zero
 * derivative), applied as p′_k = Σ_{j≠k} D_kj (y_j − y_k) so the large diagonal
 * never cancels. Evaluating f, f′, f″ then shares one loop over the nodes, and
 * no finite difference (p(x) − y_j)/(x − x_j) is ever formed, so derivatives
 * stay accurate arbitrarily close to a node.
 *
 * C∞, but it rings between points when there are many (Runge's phenomenon).
 */
import { FitError } from './fitError';
import { decodeArray, decodeNumber, decodeOptions, decodeStats, encodeArray, encodeNumber, encodeOptions, encodeStats, fitFileEnvelope, readFitFileHeader, type FitFileBase } from './fitFile';
import { edgeExtrapolation, evaluateManyPointwise, evaluateValuesPointwise, type ManyOut, type ManyResult } from './piecewisePolynomial';
import { prepareData, resolveOptions } from './prepareData';
import type { Continuity, CurveFit, CurveFitOptions, CurveMethod, Extrapolation, FitStats, Jet } from './types';

export class BarycentricPolynomial implements CurveFit {
	readonly method: CurveMethod = 'polynomial-global';
	readonly continuity: Continuity = 'Cinf';
	readonly extrapolation: Extrapolation;
	readonly domain: readonly [number, number];
	readonly knots = new Float64Array(0);
	readonly pieces = 1;
	readonly notes: readonly string[];
	readonly options: Readonly<CurveFitOptions>;
	readonly stats: Readonly<FitStats>;
	readonly nodes: Float64Array;
	readonly values: Float64Array;
	readonly weights: Float64Array;
	/** p′ at the nodes */
	readonly slopes: Float64Array;
	/** p″ at the nodes */
	readonly curvatures: Float64Array;
	private readonly edges: [Jet, Jet];

	constructor(init: {
		options: CurveFitOptions;
		nodes: Float64Array;
		values: Float64Array;
		weights: Float64Array;
		slopes: Float64Array;
		curvatures: Float64Array;
		notes?: string[];
		stats?: FitStats;
	}) {
		const n = init.nodes.length;
		if (n < 1 || init.values.length !== n || init.weights.length !== n || init.slopes.length !== n || init.curvatures.length !== n) {
			throw new FitError('bad-fit-file', 'barycentric polynomial: nodes, values, weights, slopes and curvatures must have one entry per node');
		}
		this.options = Object.freeze({ ...init.options, extrapolation: init.options.extrapolation ?? 'refuse' });
		this.extrapolation = this.options.extrapolation!;
		this.nodes = init.nodes;
		this.values = init.values;
		this.weights = init.weights;
		this.slopes = init.slopes;
		this.curvatures = init.curvatures;
		this.domain = Object.freeze([init.nodes[0], init.nodes[n - 1]] as const);
		this.notes = Object.freeze([...(init.notes ?? [])]);
		this.stats = Object.freeze({ ...(init.stats ?? {}), degree: n - 1 });
		this.edges = [this.evaluatePiece(0, this.domain[0]), this.evaluatePiece(0, this.domain[1])];
	}

	/** The polynomial itself at any x (no extrapolation rule). */
	evaluatePiece(_piece: number, x: number): Jet {
		const xs = this.nodes;
		const w = this.weights;
		const n = xs.length;
		let den = 0;
		let nf = 0;
		let n1 = 0;
		let n2 = 0;
		for (let j = 0; j < n; j++) {
			const dx = x - xs[j];
			// At a node the formula is 0/0; the nodal values are the answer.
			if (dx === 0) return { f: this.values[j], df: this.slopes[j], d2f: this.curvatures[j], outside: false };
			const t = w[j] / dx;
			den += t;
			nf += t * this.values[j];
			n1 += t * this.slopes[j];
			n2 += t * this.curvatures[j];
		}
		return { f: nf / den, df: n1 / den, d2f: n2 / den, outside: false };
	}

	evaluate(x: number): Jet {
		if (x >= this.domain[0] && x <= this.domain[1]) return this.evaluatePiece(0, x);
		const edge = edgeExtrapolation(x, this.extrapolation, this.domain, (below) => this.edges[below ? 0 : 1]);
		if (edge) return edge;
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
			representation: 'barycentric',
			knots: [],
			nodes: encodeArray(this.nodes),
			values: encodeArray(this.values),
			weights: encodeArray(this.weights),
			slopes: encodeArray(this.slopes),
			curvatures: encodeArray(this.curvatures),
			stats: encodeStats(this.stats),
			notes: [...this.notes]
		};
	}

	static fromJSON(json: unknown): BarycentricPolynomial {
		const h = readFitFileHeader(json);
		if (h.representation !== 'barycentric') throw new FitError('bad-fit-file', 'fit file: not a barycentric polynomial');
		const fit = new BarycentricPolynomial({
			options: { ...decodeOptions(h.options), extrapolation: h.extrapolation },
			nodes: decodeArray(h.nodes, 'nodes'),
			values: decodeArray(h.values, 'values'),
			weights: decodeArray(h.weights, 'weights'),
			slopes: decodeArray(h.slopes, 'slopes'),
			curvatures: decodeArray(h.curvatures, 'curvatures'),
			notes: h.notes.map(String),
			stats: decodeStats(h.stats)
		});
		if (!Object.is(decodeNumber(h.domain[0]), fit.domain[0]) || !Object.is(decodeNumber(h.domain[1]), fit.domain[1])) {
			throw new FitError('bad-fit-file', 'fit file: domain does not match the nodes');
		}
		return fit;
	}
}

/**
 * Barycentric weights, scaled so the largest is ±1. The products are formed
 * on the nodes mapped to an interval of length 4, where they neither overflow
 * nor underflow for any practical number of points (Berrut & Trefethen §7);
 * a common factor cancels in the formula.
 */
function barycentricWeights(x: Float64Array): Float64Array {
	const n = x.length;
	const w = new Float64Array(n);
	const scale = n > 1 ? 4 / (x[n - 1] - x[0]) : 1;
	let big = 0;
	for (let j = 0; j < n; j++) {
		let p = 1;
		for (let k = 0; k < n; k++) if (k !== j) p *= (x[j] - x[k]) * scale;
		w[j] = 1 / p;
		big = Math.max(big, Math.abs(w[j]));
	}
	for (let j = 0; j < n; j++) w[j] /= big;
	return w;
}

export function polynomialGlobal(x: ArrayLike<number>, y: ArrayLike<number>, options?: CurveFitOptions): BarycentricPolynomial {
	const opts = resolveOptions(options, 'polynomial-global');
	const d = prepareData(x, y, opts, { label: 'polynomial-global', minPoints: 2 });
	const xs = d.x;
	const ys = d.y;
	const n = xs.length;
	const w = barycentricWeights(xs);
	const s1 = new Float64Array(n);
	const s2 = new Float64Array(n);
	for (let k = 0; k < n; k++) {
		// Row k of D: D_kj for j ≠ k, and D_kk = −Σ D_kj.
		let dkk = 0;
		for (let j = 0; j < n; j++) if (j !== k) dkk -= w[j] / w[k] / (xs[k] - xs[j]);
		let a1 = 0;
		let a2 = 0;
		for (let j = 0; j < n; j++) {
			if (j === k) continue;
			const dxkj = xs[k] - xs[j];
			const dkj = w[j] / w[k] / dxkj;
			const dy = ys[j] - ys[k];
			a1 += dkj * dy;
			a2 += 2 * dkj * (dkk - 1 / dxkj) * dy;
		}
		s1[k] = a1;
		s2[k] = a2;
	}
	const notes = d.notes;
	if (n > 20) notes.push(`one polynomial of degree ${n - 1} through ${n} points: expect ringing between points, worst near the ends`);
	// prepareData may hand back the caller's y; the fit keeps its own copy.
	return new BarycentricPolynomial({ options: opts, nodes: xs, values: Float64Array.from(ys), weights: w, slopes: s1, curvatures: s2, notes });
}
