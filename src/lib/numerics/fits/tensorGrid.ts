/**
 * Tensor-product fits on a full grid of 2–4 inputs (axes may be unevenly
 * spaced), in the cubic Hermite form.
 *
 * Each grid cell carries one polynomial of degree ≤ 3 in every input, fixed by
 * the value and the mixed partials ∂^S f (S any subset of the inputs) at its
 * 2^d corners — the d-dimensional form of the bicubic Hermite patch of
 * J. Ferguson, 1964, "Multivariable curve interpolation", J. ACM 11(2):221–228
 * (see docs/references.md, "Surfaces"). Neighbouring cells share the corner
 * data of their common face, so f and ∂f/∂x_k are continuous everywhere and
 * every mixed partial that does not differentiate twice along one input is too;
 * only ∂²f/∂x_k² can jump, on the grid lines of input k.
 *
 * The corner data come from a one-input slope rule applied axis by axis: for
 * S = T ∪ {k} with k the highest input in S, ∂^S f along each grid line of
 * input k is the rule's knot slopes of ∂^T f on that line. For the cubic
 * splines (linear in the data) this is exactly the tensor-product spline —
 * the same surface as applying the one-input spline along each input in turn —
 * because a bicubic is fixed by its corner values, slopes and twists. Akima's
 * and PCHIP's slopes are not linear in the data, so there the order matters;
 * we take inputs in increasing order.
 *
 * grid-linear is the multilinear interpolant: the same cells with degree 1 in
 * every input and only the corner values.
 */
import { FitError } from './fitError';
import { decodeArray, encodeArray, fitFileEnvelope } from './fitFile';
import type { Continuity } from './types';
import type { GridMethod, HessianKind, SurfaceExtrapolation, SurfaceFit, SurfaceFitOptions, SurfaceJet } from './surfaceTypes';

export const GRID_MAX_INPUTS = 4;

/**
 * Knot slopes of `count` grid lines of one input (x strictly increasing): line
 * l's values are y[yo + l·yStep + i], its slopes t_i go to out[oo + l·oStep + os·i].
 */
export type LineSlopeRule = ((x: Float64Array, y: Float64Array, yo: number, yStep: number, out: Float64Array, oo: number, os: number, oStep: number, count: number) => void) & {
	/**
	 * Optional: sweep `count` lines side by side in place in the node data (line
	 * c's value i at data[base + c·lineStride + i·iStride + from], its slope at
	 * the same place with `to`). Returns false where it does not apply (the
	 * call above is then used).
	 */
	across?: (x: Float64Array, data: Float64Array, base: number, iStride: number, lineStride: number, count: number, from: number, to: number) => boolean;
};

interface TensorGridInit {
	method: GridMethod;
	/** 'C0' (multilinear), 'C1' or 'C2' along every input */
	continuity: Continuity;
	axes: Float64Array[];
	/** node data: per node 2^d slots (cubic) or 1 (linear); node index row-major, last input fastest */
	data: Float64Array;
	cubic: boolean;
	options: SurfaceFitOptions;
	notes: string[];
}

export class TensorGrid implements SurfaceFit {
	readonly method: GridMethod;
	readonly dimension: number;
	readonly continuity: Continuity;
	readonly axisContinuity: readonly Continuity[];
	readonly hessian: HessianKind;
	readonly extrapolation: SurfaceExtrapolation;
	readonly domain: readonly (readonly [number, number])[];
	readonly notes: readonly string[];
	readonly options: Readonly<SurfaceFitOptions>;
	readonly stats = Object.freeze({});
	readonly axes: readonly Float64Array[];
	readonly cubic: boolean;
	/** node data (see TensorGridInit.data) */
	readonly data: Float64Array;
	/** slots per node */
	private readonly slots: number;
	/** node index strides per input */
	private readonly strides: Int32Array;
	/** per local term J: node offset (in nodes), slot, and per-input local basis index (0…3 or 0…1) */
	private readonly termNode: Int32Array;
	private readonly termSlot: Int32Array;
	private readonly termBasis: Int32Array;
	private readonly terms: number;
	private readonly m: number;
	// scratch reused by every evaluation (fits are used from one thread at a time)
	private readonly w0: Float64Array;
	private readonly w1: Float64Array;
	private readonly w2: Float64Array;
	private readonly cell: Int32Array;
	/** per input: the cell at the start of each of 4(n − 1) equal buckets of the axis, and buckets per unit */
	private readonly bucketCell: Int32Array[];
	private readonly bucketScale: Float64Array;
	private readonly g2 = new Float64Array(2);

	constructor(init: TensorGridInit) {
		const d = init.axes.length;
		this.method = init.method;
		this.dimension = d;
		this.continuity = init.continuity;
		this.axisContinuity = Object.freeze(Array.from({ length: d }, () => init.continuity));
		this.hessian = init.continuity === 'C2' ? 'exact' : 'piecewise';
		this.extrapolation = init.options.extrapolation ?? 'refuse';
		this.axes = Object.freeze(init.axes.slice());
		this.domain = Object.freeze(init.axes.map((a) => Object.freeze([a[0], a[a.length - 1]] as const)));
		this.notes = Object.freeze(init.notes.slice());
		this.options = Object.freeze({ ...init.options });
		this.cubic = init.cubic;
		this.data = init.data;
		this.slots = init.cubic ? 1 << d : 1;
		this.strides = new Int32Array(d);
		let s = 1;
		for (let k = d - 1; k >= 0; k--) {
			this.strides[k] = s;
			s *= init.axes[k].length;
		}
		if (init.data.length !== s * this.slots) throw new FitError('shape-mismatch', `grid data: expected ${s * this.slots} numbers, got ${init.data.length}`);
		// Local terms: per input a corner c ∈ {0,1} and (cubic) a slot bit; basis index c·2 + bit (cubic) or c (linear).
		this.m = init.cubic ? 4 : 2;
		this.terms = this.m ** d;
		this.termNode = new Int32Array(this.terms);
		this.termSlot = new Int32Array(this.terms);
		this.termBasis = new Int32Array(this.terms * d);
		for (let J = 0; J < this.terms; J++) {
			let r = J;
			let node = 0;
			let slot = 0;
			for (let k = d - 1; k >= 0; k--) {
				const b = r % this.m;
				r = (r - b) / this.m;
				this.termBasis[J * d + k] = b;
				const c = init.cubic ? b >> 1 : b;
				node += c * this.strides[k];
				if (init.cubic && (b & 1) === 1) slot |= 1 << k;
			}
			this.termNode[J] = node;
			this.termSlot[J] = slot;
		}
		this.w0 = new Float64Array(d * this.m);
		this.w1 = new Float64Array(d * this.m);
		this.w2 = new Float64Array(d * this.m);
		this.cell = new Int32Array(d);
		this.bucketScale = new Float64Array(d);
		this.bucketCell = init.axes.map((a, k) => {
			const n = a.length;
			const B = 4 * (n - 1);
			const scale = B / (a[n - 1] - a[0]);
			this.bucketScale[k] = scale;
			const cells = new Int32Array(B);
			let i = 0;
			for (let b = 0; b < B; b++) {
				const start = a[0] + b / scale;
				while (i < n - 2 && a[i + 1] <= start) i++;
				cells[b] = i;
			}
			return cells;
		});
	}

	/** Per input: locate the cell and fill the basis weights and their first and second derivatives. Returns true when outside. */
	private locate(x: ArrayLike<number>, onLine: Int32Array | null): boolean {
		const d = this.dimension;
		if (x.length !== d) throw new FitError('shape-mismatch', `${this.method}: expected a point with ${d} inputs, got ${x.length}`);
		let outside = false;
		for (let k = 0; k < d; k++) {
			const a = this.axes[k];
			const v = x[k];
			const n = a.length;
			const i = this.cellOf(k, v);
			if (v < a[0] || v > a[n - 1]) outside = true;
			this.cell[k] = i;
			if (onLine) {
				// why a tolerance: an optimizer that stops on a line lands within rounding of it
				const tol = 1e-9 * (a[n - 1] - a[0]);
				let line = -1;
				if (i > 0 && Math.abs(v - a[i]) <= tol) line = i;
				else if (i + 1 < n - 1 && Math.abs(v - a[i + 1]) <= tol) line = i + 1;
				onLine[k] = line;
			}
			const h = a[i + 1] - a[i];
			const t = (v - a[i]) / h;
			const o = k * this.m;
			if (this.cubic) {
				const t2 = t * t;
				const t3 = t2 * t;
				this.w0[o] = 2 * t3 - 3 * t2 + 1;
				this.w0[o + 1] = (t3 - 2 * t2 + t) * h;
				this.w0[o + 2] = -2 * t3 + 3 * t2;
				this.w0[o + 3] = (t3 - t2) * h;
				this.w1[o] = (6 * t2 - 6 * t) / h;
				this.w1[o + 1] = 3 * t2 - 4 * t + 1;
				this.w1[o + 2] = (-6 * t2 + 6 * t) / h;
				this.w1[o + 3] = 3 * t2 - 2 * t;
				this.w2[o] = (12 * t - 6) / (h * h);
				this.w2[o + 1] = (6 * t - 4) / h;
				this.w2[o + 2] = (-12 * t + 6) / (h * h);
				this.w2[o + 3] = (6 * t - 2) / h;
			} else {
				this.w0[o] = 1 - t;
				this.w0[o + 1] = t;
				this.w1[o] = -1 / h;
				this.w1[o + 1] = 1 / h;
				this.w2[o] = 0;
				this.w2[o + 1] = 0;
			}
		}
		return outside;
	}

	private base(): number {
		let node = 0;
		for (let k = 0; k < this.dimension; k++) node += this.cell[k] * this.strides[k];
		return node;
	}

	/**
	 * The cell of v along input k (a_i ≤ v < a_{i+1}, the last cell taking the
	 * right end), after the same checks as locate. The 2-D fast paths use it.
	 */
	private cellOf(k: number, v: number): number {
		const a = this.axes[k];
		const n = a.length;
		if (!(v >= a[0] && v <= a[n - 1])) {
			if (!Number.isFinite(v)) throw new FitError('invalid-point', `${this.method}: input ${k + 1} is ${v}, not a finite number`);
			if (this.extrapolation === 'refuse') {
				throw new FitError('outside-domain', `${this.method}: input ${k + 1} = ${v} lies outside the data [${a[0]}, ${a[n - 1]}]`);
			}
		}
		// why buckets: a binary search over a 200-point axis costs ~8 unpredictable branches; the bucket
		// of v gives the cell at the bucket's start, and at most a step or two (uneven spacing) finds v's
		if (v >= a[n - 2]) return n - 2;
		if (v <= a[0]) return 0;
		const cells = this.bucketCell[k];
		let b = Math.floor((v - a[0]) * this.bucketScale[k]);
		if (b >= cells.length) b = cells.length - 1;
		// v's cell lies between the cells at this bucket's start and the next one's (usually the same
		// cell, or the next); a search between them stays logarithmic on the most uneven axis
		let lo = cells[b];
		let hi = b + 1 < cells.length ? cells[b + 1] : n - 2;
		// the bucket's start computed with rounding can land a hair past v (or short of it)
		while (lo > 0 && a[lo] > v) lo--;
		while (hi < n - 2 && a[hi + 1] <= v) hi++;
		while (hi > lo) {
			const mid = (lo + hi + 1) >> 1;
			if (a[mid] <= v) lo = mid;
			else hi = mid - 1;
		}
		return lo;
	}

	/** f and ∇f of a two-input fit: the same sums as the general path, written out (the hot path of 2-D studies and maps). */
	private valueGradient2(x: ArrayLike<number>, grad: Float64Array): number {
		if (x.length !== 2) throw new FitError('shape-mismatch', `${this.method}: expected a point with 2 inputs, got ${x.length}`);
		const ax = this.axes[0];
		const ay = this.axes[1];
		const u = x[0];
		const v = x[1];
		const i = this.cellOf(0, u);
		const j = this.cellOf(1, v);
		const hx = ax[i + 1] - ax[i];
		const hy = ay[j + 1] - ay[j];
		const t = (u - ax[i]) / hx;
		const s = (v - ay[j]) / hy;
		const ny = ay.length;
		const D = this.data;
		if (!this.cubic) {
			const p = i * ny + j;
			const f00 = D[p];
			const f01 = D[p + 1];
			const f10 = D[p + ny];
			const f11 = D[p + ny + 1];
			const lo = f00 + s * (f01 - f00);
			const hi = f10 + s * (f11 - f10);
			grad[0] = (hi - lo) / hx;
			grad[1] = ((1 - t) * (f01 - f00) + t * (f11 - f10)) / hy;
			return lo + t * (hi - lo);
		}
		// Hermite weights along each input: value at the left node, slope there, value at the right, slope there
		// (written out for both inputs, not through a helper: locals in registers are this path's whole gain)
		const t2 = t * t;
		const t3 = t2 * t;
		const a0 = 2 * t3 - 3 * t2 + 1;
		const a1 = (t3 - 2 * t2 + t) * hx;
		const a2 = -2 * t3 + 3 * t2;
		const a3 = (t3 - t2) * hx;
		const b0 = (6 * t2 - 6 * t) / hx;
		const b1 = 3 * t2 - 4 * t + 1;
		const b2 = -b0;
		const b3 = 3 * t2 - 2 * t;
		const s2 = s * s;
		const s3 = s2 * s;
		const c0 = 2 * s3 - 3 * s2 + 1;
		const c1 = (s3 - 2 * s2 + s) * hy;
		const c2 = -2 * s3 + 3 * s2;
		const c3 = (s3 - s2) * hy;
		const e0 = (6 * s2 - 6 * s) / hy;
		const e1 = 3 * s2 - 4 * s + 1;
		const e2 = -e0;
		const e3 = 3 * s2 - 2 * s;
		// node data: 4 slots (f, ∂f/∂x₁, ∂f/∂x₂, ∂²f/∂x₁∂x₂) per node
		const p00 = (i * ny + j) * 4;
		const p01 = p00 + 4;
		const p10 = p00 + ny * 4;
		const p11 = p10 + 4;
		// along input 2 first: for each x-basis function (node i or i+1, value or x-slope) the sum over the y-basis
		const r0 = c0 * D[p00] + c1 * D[p00 + 2] + c2 * D[p01] + c3 * D[p01 + 2];
		const r1 = c0 * D[p00 + 1] + c1 * D[p00 + 3] + c2 * D[p01 + 1] + c3 * D[p01 + 3];
		const r2 = c0 * D[p10] + c1 * D[p10 + 2] + c2 * D[p11] + c3 * D[p11 + 2];
		const r3 = c0 * D[p10 + 1] + c1 * D[p10 + 3] + c2 * D[p11 + 1] + c3 * D[p11 + 3];
		const q0 = e0 * D[p00] + e1 * D[p00 + 2] + e2 * D[p01] + e3 * D[p01 + 2];
		const q1 = e0 * D[p00 + 1] + e1 * D[p00 + 3] + e2 * D[p01 + 1] + e3 * D[p01 + 3];
		const q2 = e0 * D[p10] + e1 * D[p10 + 2] + e2 * D[p11] + e3 * D[p11 + 2];
		const q3 = e0 * D[p10 + 1] + e1 * D[p10 + 3] + e2 * D[p11 + 1] + e3 * D[p11 + 3];
		grad[0] = b0 * r0 + b1 * r1 + b2 * r2 + b3 * r3;
		grad[1] = a0 * q0 + a1 * q1 + a2 * q2 + a3 * q3;
		return a0 * r0 + a1 * r1 + a2 * r2 + a3 * r3;
	}

	value(x: ArrayLike<number>): number {
		if (this.dimension === 2) return this.valueGradient2(x, this.g2);
		this.locate(x, null);
		const d = this.dimension;
		const base = this.base();
		let f = 0;
		for (let J = 0; J < this.terms; J++) {
			let p = this.data[(base + this.termNode[J]) * this.slots + this.termSlot[J]];
			for (let k = 0; k < d; k++) p *= this.w0[k * this.m + this.termBasis[J * d + k]];
			f += p;
		}
		return f;
	}

	valueGradient(x: ArrayLike<number>, grad: Float64Array): number {
		if (this.dimension === 2) return this.valueGradient2(x, grad);
		this.locate(x, null);
		const d = this.dimension;
		const base = this.base();
		let f = 0;
		grad.fill(0, 0, d);
		const a = this.w0;
		const b = this.w1;
		const m = this.m;
		for (let J = 0; J < this.terms; J++) {
			const v = this.data[(base + this.termNode[J]) * this.slots + this.termSlot[J]];
			if (v === 0) continue;
			const jb = J * d;
			// why prefix/suffix products: ∂/∂x_j replaces one factor, with no division (a factor can be 0)
			let prefix = v;
			for (let j = 0; j < d; j++) {
				let suffix = 1;
				for (let k = j + 1; k < d; k++) suffix *= a[k * m + this.termBasis[jb + k]];
				const bj = this.termBasis[jb + j];
				grad[j] += prefix * b[j * m + bj] * suffix;
				prefix *= a[j * m + bj];
			}
			f += prefix;
		}
		return f;
	}

	evaluate(x: ArrayLike<number>): SurfaceJet {
		const d = this.dimension;
		const onLine = new Int32Array(d);
		const outside = this.locate(x, onLine);
		const base = this.base();
		const grad = new Float64Array(d);
		const hess = new Float64Array(d * d);
		const m = this.m;
		const fa = new Float64Array(d);
		const fb = new Float64Array(d);
		const fe = new Float64Array(d);
		let f = 0;
		for (let J = 0; J < this.terms; J++) {
			const v = this.data[(base + this.termNode[J]) * this.slots + this.termSlot[J]];
			if (v === 0) continue;
			for (let k = 0; k < d; k++) {
				const bk = k * m + this.termBasis[J * d + k];
				fa[k] = this.w0[bk];
				fb[k] = this.w1[bk];
				fe[k] = this.w2[bk];
			}
			for (let j = 0; j < d; j++) {
				let pj = v;
				for (let k = 0; k < d; k++) if (k !== j) pj *= fa[k];
				grad[j] += pj * fb[j];
				hess[j * d + j] += pj * fe[j];
				for (let l = j + 1; l < d; l++) {
					let pjl = v * fb[j] * fb[l];
					for (let k = 0; k < d; k++) if (k !== j && k !== l) pjl *= fa[k];
					hess[j * d + l] += pjl;
				}
			}
			let p = v;
			for (let k = 0; k < d; k++) p *= fa[k];
			f += p;
		}
		for (let j = 0; j < d; j++) for (let l = j + 1; l < d; l++) hess[l * d + j] = hess[j * d + l];
		return { f, grad, hess, outside, onLine };
	}

	/** Value at a grid node (row-major node index). */
	nodeValue(node: number): number {
		return this.data[node * this.slots];
	}

	toJSON(): unknown {
		return {
			...fitFileEnvelope(this),
			domain: this.domain.map((r) => encodeArray(r)),
			options: { ...this.options },
			representation: 'tensor-hermite',
			axes: this.axes.map((a) => encodeArray(a)),
			cubic: this.cubic,
			data: encodeArray(this.data),
			notes: [...this.notes]
		};
	}

	static fromJSON(json: unknown): TensorGrid {
		const o = json as Record<string, unknown>;
		if (!o || typeof o !== 'object' || o.representation !== 'tensor-hermite' || !Array.isArray(o.axes)) {
			throw new FitError('bad-fit-file', 'fit file: not a tensor-hermite grid fit');
		}
		const axes = (o.axes as unknown[]).map((a, k) => decodeArray(a, `axes[${k}]`));
		const ext = o.extrapolation === 'extend' ? 'extend' : 'refuse';
		return new TensorGrid({
			method: o.method as GridMethod,
			continuity: o.continuity as Continuity,
			axes,
			data: decodeArray(o.data, 'data'),
			cubic: o.cubic === true,
			options: { extrapolation: ext },
			notes: Array.isArray(o.notes) ? (o.notes as unknown[]).map(String) : []
		});
	}
}

/**
 * Fills the derivative slots of cubic node data in place: slot S (a bit set of
 * inputs) along the grid lines of k = highest bit of S is `rule` applied to
 * slot S without k. Slot 0 must hold the values.
 *
 * Lines of the last input are contiguous nodes: a few at a time are read into
 * a line buffer and the rule writes their slopes straight into the node data. A line
 * of any other input is strided in memory, and walking it touches one number
 * per cache line; so each (n_k × stride_k) block is gathered transposed (in
 * tiles) into a work plane, the rule runs on its contiguous lines (by offset:
 * a subarray view per line costs more than the line's arithmetic), and the
 * result is scattered back transposed. Rules take many lines per call so the
 * spline can sweep two at once.
 *
 * A rule with a side-by-side sweep (rule.across) is given the lines in place
 * instead (acrossFamily): no gather, no transpose, every line advanced one knot
 * per step. The sweeps repeat the one-line arithmetic operation for operation
 * (tests/unit/fits/gridAcross.test.ts holds them to the same bits).
 */
export function fillHermiteSlots(axes: readonly Float64Array[], data: Float64Array, rule: LineSlopeRule): void {
	const d = axes.length;
	const slots = 1 << d;
	const sizes = axes.map((a) => a.length);
	const total = sizes.reduce((p, n) => p * n, 1);
	const strides = new Array<number>(d);
	let s = 1;
	for (let k = d - 1; k >= 0; k--) {
		strides[k] = s;
		s *= sizes[k];
	}
	// lines of the last input are read LINES at a time into a line buffer
	const LINES = 8;
	const line = new Float64Array(LINES * Math.max(...sizes));
	const block = planeScratch(2 * total);
	const tin = block.subarray(0, total);
	const tout = block.subarray(total, 2 * total);
	for (let S = 1; S < slots; S++) {
		const k = 31 - Math.clz32(S);
		const from = S ^ (1 << k);
		const n = sizes[k];
		const inner = strides[k];
		const x = axes[k];
		if (rule.across && acrossFamily(rule.across, x, data, total, slots, n, inner, from, S)) continue;
		if (inner === 1) {
			for (let o = 0; o < total; o += LINES * n) {
				const count = Math.min(LINES, (total - o) / n);
				for (let i = 0, q = o * slots + from; i < count * n; i++, q += slots) line[i] = data[q];
				rule(x, line, 0, n, data, o * slots + S, slots, n * slots, count);
			}
			continue;
		}
		const run = n * inner;
		for (let o = 0; o < total; o += run) {
			moveTransposed(data, o, slots, from, n, inner, tin, true);
			rule(x, tin, 0, n, tout, 0, 1, n, inner);
			moveTransposed(data, o, slots, S, n, inner, tout, false);
		}
	}
}

/**
 * One family of lines (input k: n knots, node stride `inner`) by the rule's
 * side-by-side sweep. Lines of an earlier input: the lines of one block of
 * n × inner nodes sit next to each other (line stride one node), so a step
 * of the sweep reads a contiguous run. Lines of the last input: ACROSS lines
 * at a time (line stride n nodes), whose step touches one cache line per line
 * and whose next step reuses it.
 */
const ACROSS = 32;
const ACROSS_RUN = 64;
function acrossFamily(
	across: NonNullable<LineSlopeRule['across']>,
	x: Float64Array,
	data: Float64Array,
	total: number,
	slots: number,
	n: number,
	inner: number,
	from: number,
	to: number
): boolean {
	if (inner === 1) {
		for (let o = 0; o < total; o += ACROSS * n) {
			if (!across(x, data, o * slots, slots, n * slots, Math.min(ACROSS, (total - o) / n), from, to)) return false;
		}
		return true;
	}
	// a block's inner lines ACROSS_RUN at a time: a rule's per-line scratch stays small (Akima: (n + 3) per line)
	const run = n * inner;
	for (let o = 0; o < total; o += run) {
		for (let c = 0; c < inner; c += ACROSS_RUN) if (!across(x, data, (o + c) * slots, inner * slots, slots, Math.min(ACROSS_RUN, inner - c), from, to)) return false;
	}
	return true;
}

/**
 * Between slot `slot` of the rows × cols block of nodes starting at node o
 * (node o + r·cols + c) and a plane holding it transposed (plane[c·rows + r]):
 * gather into the plane, or scatter from it. In 32 × 32 tiles.
 */
function moveTransposed(data: Float64Array, o: number, slots: number, slot: number, rows: number, cols: number, plane: Float64Array, gather: boolean): void {
	const T = 32;
	for (let r0 = 0; r0 < rows; r0 += T) {
		const r1 = Math.min(rows, r0 + T);
		for (let c0 = 0; c0 < cols; c0 += T) {
			const c1 = Math.min(cols, c0 + T);
			for (let r = r0; r < r1; r++) {
				const base = (o + r * cols) * slots + slot;
				if (gather) for (let c = c0; c < c1; c++) plane[c * rows + r] = data[base + c * slots];
				else for (let c = c0; c < c1; c++) data[base + c * slots] = plane[c * rows + r];
			}
		}
	}
}

/**
 * Why a kept block: a fresh typed array of a few hundred kilobytes costs more
 * here (page faults and zeroing on first touch) than the slope rules' work on
 * it. Blocks up to POOL_LIMIT numbers are kept for the next build (one per
 * thread: builds are synchronous); larger ones are left to the collector.
 */
const POOL_LIMIT = 1 << 20;
let pool = new Float64Array(0);
function planeScratch(size: number): Float64Array {
	if (size > POOL_LIMIT) return new Float64Array(size);
	if (pool.length < size) pool = new Float64Array(size);
	return pool;
}
