/**
 * Input contract shared by every curve method: the table's x and y columns
 * become sorted, finite, distinct Float64Arrays, or a FitError says which rows
 * are at fault (1-based, in the order the rows were given).
 */
import { FitError, describeRows } from './fitError';
import type { CurveFitOptions } from './types';

export interface PreparedData {
	/** strictly increasing abscissae */
	x: Float64Array;
	/** ordinates matching x — may be the caller's own array (fast path): read it, never keep or modify it */
	y: Float64Array;
	/** weight per point (the input weights; averaged duplicates carry the summed weight of their group) */
	w: Float64Array | null;
	/** the 1-based input rows prepared point k came from (one row, or a merged duplicate group) */
	rowsOf(k: number): number[];
	notes: string[];
}

interface PrepareRules {
	/** the method's name, for messages */
	label: string;
	/** fewest distinct points the method needs */
	minPoints: number;
	/** why that many (appended to the message) */
	minReason?: string;
	/** the method uses weights (otherwise options.weights is refused) */
	acceptsWeights?: boolean;
}

/**
 * Validate and normalise (x, y). Unsorted input is sorted (stable; noted);
 * non-finite rows are an error or, with `nonFinite: 'drop'`, dropped (noted);
 * repeated x is an error or, with `duplicates: 'average'`, merged into one
 * point at the (weighted) mean y (noted).
 */
export function prepareData(
	xIn: ArrayLike<number>,
	yIn: ArrayLike<number>,
	options: CurveFitOptions,
	rules: PrepareRules
): PreparedData {
	const notes: string[] = [];
	if (xIn == null || yIn == null || typeof xIn.length !== 'number' || typeof yIn.length !== 'number') {
		throw new FitError('bad-option', `${rules.label}: x and y must be arrays of numbers`);
	}
	if (xIn.length !== yIn.length) {
		throw new FitError('length-mismatch', `${rules.label}: x has ${xIn.length} values but y has ${yIn.length}`);
	}
	const wIn = options.weights;
	if (wIn != null) {
		if (!rules.acceptsWeights) throw new FitError('bad-option', `${rules.label} does not use weights`);
		if (wIn.length !== xIn.length) {
			throw new FitError('length-mismatch', `${rules.label}: ${wIn.length} weights for ${xIn.length} rows`);
		}
	}
	const nIn = xIn.length;

	// Fast path, the common case: finite, strictly increasing x, finite y, no weights —
	// one pass decides it, x is copied (the fit keeps it) and a Float64Array y is used in place.
	if (wIn == null && nIn >= rules.minPoints) {
		let ok = true;
		let prev = -Infinity;
		// typed arrays hold numbers only; a plain array may hold null, booleans or numeric
		// strings, for which v − v is 0 too (null → 0, "3" → 3): check each element's type
		const typed = ArrayBuffer.isView(xIn) && ArrayBuffer.isView(yIn);
		for (let i = 0; i < nIn; i++) {
			const xi = xIn[i];
			const yi = yIn[i];
			// v − v is 0 exactly for finite numbers (NaN for NaN, ±Infinity and most non-numbers).
			if (!(xi > prev) || xi - xi !== 0 || yi - yi !== 0 || (!typed && (typeof xi !== 'number' || typeof yi !== 'number'))) {
				ok = false;
				break;
			}
			prev = xi;
		}
		if (ok) {
			const x = xIn instanceof Float64Array ? xIn.slice() : Float64Array.from(xIn);
			const y = yIn instanceof Float64Array ? yIn : Float64Array.from(yIn);
			return { x, y, w: null, rowsOf: (k: number) => [k + 1], notes };
		}
	}

	// Values that are not numbers at all (null, booleans, strings — never read as 0 or
	// converted), then non-finite numbers, listed by row.
	const notNumbers: number[] = [];
	for (let i = 0; i < nIn; i++) if (typeof xIn[i] !== 'number' || typeof yIn[i] !== 'number') notNumbers.push(i + 1);
	if (notNumbers.length > 0) {
		throw new FitError(
			'non-finite',
			`${rules.label}: a value that is not a number (null, a boolean or text) in row${notNumbers.length > 1 ? 's' : ''} ${describeRows(notNumbers)}`,
			notNumbers
		);
	}
	const bad: number[] = [];
	for (let i = 0; i < nIn; i++) {
		const xi = xIn[i];
		const yi = yIn[i];
		const wi = wIn ? wIn[i] : 1;
		if (!Number.isFinite(xi) || !Number.isFinite(yi)) bad.push(i + 1);
		else if (!(typeof wi === 'number' && Number.isFinite(wi) && wi > 0)) {
			throw new FitError('bad-option', `${rules.label}: weight in row ${i + 1} must be a positive finite number`, [i + 1]);
		}
	}
	let keep: Int32Array | null = null;
	if (bad.length > 0) {
		if (options.nonFinite !== 'drop') {
			throw new FitError(
				'non-finite',
				`${rules.label}: NaN or infinite value in row${bad.length > 1 ? 's' : ''} ${describeRows(bad)}`,
				bad
			);
		}
		keep = new Int32Array(nIn - bad.length);
		let k = 0;
		for (let i = 0, b = 0; i < nIn; i++) {
			if (b < bad.length && bad[b] === i + 1) b++;
			else keep[k++] = i;
		}
		notes.push(`dropped ${bad.length} row${bad.length > 1 ? 's' : ''} with NaN or infinite values (rows ${describeRows(bad)})`);
	}

	const n = keep ? keep.length : nIn;
	let order: Int32Array | null = keep;
	// Sortedness check first: the common case (already sorted) costs one pass and no index sort.
	let sorted = true;
	for (let k = 1; k < n; k++) {
		const a = xIn[order ? order[k - 1] : k - 1];
		const b = xIn[order ? order[k] : k];
		if (b < a) {
			sorted = false;
			break;
		}
	}
	if (!sorted) {
		const idx = order ? Array.from(order) : Array.from({ length: n }, (_, i) => i);
		// Array.prototype.sort is stable, so rows with equal x keep their input order.
		idx.sort((a, b) => (xIn[a] as number) - (xIn[b] as number));
		order = Int32Array.from(idx);
		notes.push('x was not in increasing order; the rows were sorted by x');
	}

	let x = new Float64Array(n);
	let y = new Float64Array(n);
	let w: Float64Array | null = wIn ? new Float64Array(n) : null;
	if (order) {
		for (let k = 0; k < n; k++) {
			const i = order[k];
			x[k] = xIn[i];
			y[k] = yIn[i];
			if (w) w[k] = wIn![i];
		}
	} else {
		// Float64Array.prototype.set is a memcpy for typed input; the loop handles plain arrays.
		if (xIn instanceof Float64Array) x.set(xIn);
		else for (let k = 0; k < n; k++) x[k] = xIn[k];
		if (yIn instanceof Float64Array) y.set(yIn);
		else for (let k = 0; k < n; k++) y[k] = yIn[k];
		if (w) for (let k = 0; k < n; k++) w[k] = wIn![k];
	}
	const rowOf = (k: number) => (order ? order[k] : k) + 1;

	// Duplicate x (adjacent after sorting).
	let dupRows: number[] | null = null;
	for (let k = 1; k < n; k++) {
		if (x[k] === x[k - 1]) {
			dupRows ??= [];
			if (k === 1 || x[k - 1] !== x[k - 2]) dupRows.push(rowOf(k - 1));
			dupRows.push(rowOf(k));
		}
	}
	let rowsOf = (k: number): number[] => [rowOf(k)];
	if (dupRows) {
		if (options.duplicates !== 'average') {
			dupRows.sort((a, b) => a - b);
			throw new FitError(
				'duplicate-x',
				`${rules.label}: repeated x values in rows ${describeRows(dupRows)} (use duplicates: 'average' to merge them)`,
				dupRows
			);
		}
		const xs: number[] = [];
		const ys: number[] = [];
		const ws: number[] = [];
		const groupsRows: number[][] = [];
		let groups = 0;
		for (let k = 0; k < n; ) {
			let j = k;
			let sw = 0;
			let swy = 0;
			const group: number[] = [];
			while (j < n && x[j] === x[k]) {
				const wj = w ? w[j] : 1;
				sw += wj;
				swy += wj * y[j];
				group.push(rowOf(j));
				j++;
			}
			if (j - k > 1) groups++;
			xs.push(x[k]);
			ys.push(j - k > 1 ? swy / sw : y[k]);
			ws.push(sw);
			groupsRows.push(group.sort((a, b) => a - b));
			k = j;
		}
		x = Float64Array.from(xs);
		y = Float64Array.from(ys);
		// Averaging k rows into one is exact for a squared-error fit only if the mean carries weight k.
		w = Float64Array.from(ws);
		rowsOf = (k: number) => groupsRows[k].slice();
		notes.push(
			`averaged ${groups} group${groups > 1 ? 's' : ''} of repeated x (rows ${describeRows(dupRows.sort((a, b) => a - b))}); each mean carries its group's total weight`
		);
	}

	if (x.length < rules.minPoints) {
		throw new FitError(
			'too-few-points',
			`${rules.label} needs at least ${rules.minPoints} distinct points${rules.minReason ? ` (${rules.minReason})` : ''}; got ${x.length}`
		);
	}
	return { x, y, w, rowsOf, notes };
}

const EXTRAPOLATIONS = ['refuse', 'hold', 'linear', 'extend'];

/**
 * Copy the options with defaults filled in (extrapolation 'refuse') and the
 * shared settings checked; weights become a plain array so the options stay
 * JSON-safe.
 */
export function resolveOptions(options: CurveFitOptions | undefined, label: string): CurveFitOptions {
	const o: CurveFitOptions = { ...(options ?? {}) };
	for (const k of Object.keys(o) as (keyof CurveFitOptions)[]) if (o[k] === undefined) delete o[k];
	o.extrapolation ??= 'refuse';
	if (!EXTRAPOLATIONS.includes(o.extrapolation)) {
		throw new FitError('bad-option', `${label}: extrapolation must be one of ${EXTRAPOLATIONS.join(', ')}`);
	}
	if (o.duplicates !== undefined && o.duplicates !== 'error' && o.duplicates !== 'average') {
		throw new FitError('bad-option', `${label}: duplicates must be 'error' or 'average'`);
	}
	if (o.nonFinite !== undefined && o.nonFinite !== 'error' && o.nonFinite !== 'drop') {
		throw new FitError('bad-option', `${label}: nonFinite must be 'error' or 'drop'`);
	}
	if (o.weights !== undefined) o.weights = Array.from(o.weights);
	if (o.slopes !== undefined) o.slopes = Array.from(o.slopes) as unknown as [number, number];
	return o;
}
