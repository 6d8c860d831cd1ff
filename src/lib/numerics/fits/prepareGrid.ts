/**
 * Checks and normalises the input of a grid fit: 2–4 axes, each strictly
 * monotone with enough points for the method, and one finite value per node
 * (row-major: the last input varies fastest). A strictly decreasing axis is
 * reversed (with its values) and noted.
 */
import { FitError, describeRows } from './fitError';
import { GRID_MAX_INPUTS } from './tensorGrid';

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
		const a = Float64Array.from(axesIn[k]);
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
	const values = new Float64Array(total);
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
		throw new FitError('non-finite', `${label}: non-finite values at grid nodes ${describeRows(badV)} (1-based, last input fastest)`, badV);
	}
	return { axes, values, notes };
}
