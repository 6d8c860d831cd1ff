/**
 * Is a table of several inputs a full grid? (common practice, no source)
 * A table is a grid when its distinct values per input form a tensor product
 * with exactly one row per cell. Otherwise it is scattered; when only some
 * cells are missing, the first missing cell is named so the user can fill it
 * in or choose to treat the table as scatter. Repeated cells are named too.
 */
import { FitError } from './fitError';

export type TableShape =
	| {
			kind: 'grid';
			/** sorted distinct values per input */
			axes: Float64Array[];
			/** for each grid node (row-major, last input fastest), the 0-based table row holding it */
			rowOfNode: Int32Array;
	  }
	| {
			kind: 'scatter';
			/** why it is not a grid (null when it plainly is not one: more cells missing than present) */
			reason: string;
			/** a missing cell's inputs, when the table is a grid but for missing cells */
			missingCell?: number[];
			missingCount?: number;
			/** 1-based rows that repeat a cell */
			repeatedRows?: number[];
	  };

export function classifyTable(rows: readonly ArrayLike<number>[]): TableShape {
	if (rows.length === 0) throw new FitError('too-few-points', 'the table has no rows');
	const d = rows[0].length;
	for (let r = 0; r < rows.length; r++) {
		if (rows[r].length !== d) throw new FitError('shape-mismatch', `row ${r + 1} has ${rows[r].length} inputs, expected ${d}`, [r + 1]);
		for (let k = 0; k < d; k++) if (!Number.isFinite(rows[r][k])) throw new FitError('non-finite', `row ${r + 1}: input ${k + 1} is not a finite number`, [r + 1]);
	}
	const axes = Array.from({ length: d }, (_, k) => Float64Array.from(new Set(rows.map((p) => p[k]))).sort());
	const sizes = axes.map((a) => a.length);
	const total = sizes.reduce((p, n) => p * n, 1);
	const index = axes.map((a) => new Map(Array.from(a, (v, i) => [v, i] as const)));
	const rowOfNode = new Int32Array(total).fill(-1);
	const repeated: number[] = [];
	rows.forEach((p, r) => {
		let node = 0;
		for (let k = 0; k < d; k++) node = node * sizes[k] + index[k].get(p[k])!;
		if (rowOfNode[node] >= 0) repeated.push(r + 1);
		else rowOfNode[node] = r;
	});
	if (repeated.length) {
		return { kind: 'scatter', reason: `rows ${repeated.slice(0, 10).join(', ')} repeat a cell already given`, repeatedRows: repeated };
	}
	const missing = total - rows.length;
	if (missing === 0) return { kind: 'grid', axes, rowOfNode };
	if (missing * 2 > total) return { kind: 'scatter', reason: `${rows.length} rows cover ${rows.length} of ${total} cells of the ${sizes.join(' × ')} grid their values span` };
	const first = rowOfNode.indexOf(-1);
	const cell: number[] = [];
	let rest = first;
	for (let k = d - 1; k >= 0; k--) {
		cell.unshift(axes[k][rest % sizes[k]]);
		rest = Math.floor(rest / sizes[k]);
	}
	return {
		kind: 'scatter',
		reason: `not a full ${sizes.join(' × ')} grid: ${missing} cell${missing === 1 ? '' : 's'} missing, the first at (${cell.join(', ')}); fill ${missing === 1 ? 'it' : 'them'} in, or treat the table as scattered points`,
		missingCell: cell,
		missingCount: missing
	};
}
