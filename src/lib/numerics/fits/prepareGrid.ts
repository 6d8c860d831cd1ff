/**
 * Checks and normalises the input of a grid fit: 2–4 axes, each strictly
 * monotone with enough points for the method, and one finite value per node
 * (row-major: the last input varies fastest). A strictly decreasing axis is
 * reversed (with its values) and noted.
 */
import { FitError, describeRows } from './fitError';
import { GRID_MAX_INPUTS } from './tensorGrid';
import { allFinite } from '../math';

export interface PreparedGrid {
	axes: Float64Array[];
	values: Float64Array;
	notes: string[];
}

export function prepareGrid(axesIn: readonly ArrayLike<number>[], valuesIn: ArrayLike<number>, label: string, minPoints: number): PreparedGrid {
	const d = axesIn.length;
	if (d < 2) throw new FitError('too-few-points', `${label}: a grid fit needs at least 2 inputs, got ${d} (use a curve fit for one input)`);
	if (d > GRID_MAX_INPUTS) throw new FitError('too-many-inputs', `${label}: at most ${GRID_MAX_INPUTS} inputs on a grid, got ${d} (use a scattered fit, rbf-*, for more)`);
	const notes: string[] = [];
	const axes: Float64Array[] = [];
	const reversed: boolean[] = [];
	for (let k = 0; k < d; k++) {
		const src = axesIn[k];
		const a = src instanceof Float64Array ? src.slice() : Float64Array.from(src);
		const n = a.length;
		if (n < minPoints) {
			throw new FitError('too-few-points', `${label}: input ${k + 1} has ${n} grid value${n === 1 ? '' : 's'}; the method needs at least ${minPoints} per input`);
		}
		const bad: number[] = [];
		for (let i = 0; i < n; i++) if (!Number.isFinite(a[i])) bad.push(i + 1);
		if (bad.length) throw new FitError('non-finite', `${label}: input ${k + 1} has non-finite grid values at positions ${describeRows(bad)}`, bad);
		const up = a[1] > a[0];
		for (let i = 1; i < n; i++) {
			if (up ? !(a[i] > a[i - 1]) : !(a[i] < a[i - 1])) {
				throw new FitError(
					'non-monotone-axis',
					`${label}: input ${k + 1} is not strictly ${up ? 'increasing' : 'decreasing'}: position ${i + 1} (${a[i]}) after position ${i} (${a[i - 1]})`,
					[i, i + 1]
				);
			}
		}
		if (!up) {
			a.reverse();
			notes.push(`input ${k + 1} was decreasing; reversed`);
		}
		reversed.push(!up);
		axes.push(a);
	}
	const sizes = axes.map((a) => a.length);
	const total = sizes.reduce((p, n) => p * n, 1);
	if (valuesIn.length !== total) {
		throw new FitError('shape-mismatch', `${label}: a ${sizes.join(' × ')} grid has ${total} nodes, but ${valuesIn.length} values were given`);
	}
	if (!reversed.includes(true) && valuesIn instanceof Float64Array) {
		// why no copy: the nodes are already in order, so the caller's array is kept as it is (as SciPy's
		// RegularGridInterpolator keeps its values); fitGrid's contract says the caller must not change it
		if (!allFinite(valuesIn)) throw nonFinite(label, badNodes(valuesIn, total));
		return { axes, values: valuesIn, notes };
	}
	const values = new Float64Array(total);
	if (!reversed.includes(true)) {
		// every axis already increasing: the nodes are in the caller's order (the common case, one pass)
		let ok = true;
		for (let i = 0; i < total; i++) {
			const v = valuesIn[i];
			if (!Number.isFinite(v)) ok = false;
			values[i] = v;
		}
		if (!ok) throw nonFinite(label, badNodes(valuesIn, total));
		return { axes, values, notes };
	}
	const badV: number[] = [];
	const idx = new Array<number>(d).fill(0);
	for (let node = 0; node < total; node++) {
		// source index of this (normalised) node
		let src = 0;
		for (let k = 0; k < d; k++) src = src * sizes[k] + (reversed[k] ? sizes[k] - 1 - idx[k] : idx[k]);
		const v = valuesIn[src];
		if (!Number.isFinite(v)) badV.push(src + 1);
		values[node] = v;
		for (let k = d - 1; k >= 0; k--) {
			if (++idx[k] < sizes[k]) break;
			idx[k] = 0;
		}
	}
	if (badV.length) {
		badV.sort((p, q) => p - q);
		throw nonFinite(label, badV);
	}
	return { axes, values, notes };
}

function nonFinite(label: string, bad: number[]): FitError {
	return new FitError('non-finite', `${label}: non-finite values at grid nodes ${describeRows(bad)} (1-based, last input fastest)`, bad);
}

function badNodes(v: ArrayLike<number>, total: number): number[] {
	const bad: number[] = [];
	for (let i = 0; i < total; i++) if (!Number.isFinite(v[i])) bad.push(i + 1);
	return bad;
}
