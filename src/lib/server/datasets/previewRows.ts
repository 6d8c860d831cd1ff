import { clipForMessage } from './limits';
import type { Cell, ParsedTable, ValidationIssue } from './types';

/** One row of the upload preview. */
export interface PreviewRow {
	/** the row number the user sees */
	row: number;
	/** the cells as read (long texts clipped); a left-out row has as many as it had fields */
	cells: Cell[];
	/** the problem of each cell that has one (by column position), null elsewhere; null when no cell has one */
	bad: (string | null)[] | null;
	/** every problem listed for this row, as the report words it */
	problems: string[];
	/** the row has the wrong number of fields, so it was not read into the columns */
	leftOut: boolean;
	/** rows are skipped between this row and the one shown before it (or the start) */
	gapBefore: boolean;
}

interface PreviewOptions {
	/** the first rows, always shown */
	head?: number;
	/** at most this many rows with problems, the first ones in row order */
	problemRows?: number;
}

/**
 * The rows the upload page shows: the first few rows of the table, and the
 * rows with listed problems, in row order, with each bad cell marked with its
 * problem so the preview can highlight it.
 */
export function previewRows(parsed: ParsedTable, errors: readonly ValidationIssue[], options: PreviewOptions = {}): PreviewRow[] {
	const head = options.head ?? 8;
	const maxProblemRows = options.problemRows ?? 30;
	const columnIndex = new Map<string, number>();
	parsed.columns.forEach((c, j) => {
		if (!columnIndex.has(c.name)) columnIndex.set(c.name, j);
	});
	const leftOut = new Map((parsed.badRows ?? []).map((b) => [b.row, b]));

	const byRow = new Map<number, ValidationIssue[]>();
	for (const e of errors) {
		if (e.row === undefined) continue;
		const list = byRow.get(e.row);
		if (list) list.push(e);
		else if (byRow.size < maxProblemRows) byRow.set(e.row, [e]);
	}

	const shown = new Set<number>(parsed.rowNumbers.slice(0, head));
	for (const row of byRow.keys()) if (leftOut.has(row) || indexOf(parsed.rowNumbers, row) >= 0) shown.add(row);
	const rows = [...shown].sort((a, b) => a - b);
	// data rows (read or left out) above a row, to tell where the preview skips some; rows left out
	// beyond those badRows lists (past the 100th) are not known here, a gap among them may go unmarked
	const leftOutRows = [...leftOut.keys()].sort((a, b) => a - b);
	const dataRowsBefore = (row: number) => lowerBound(parsed.rowNumbers, row) + lowerBound(leftOutRows, row);

	return rows.map((row, k) => {
		const issues = byRow.get(row) ?? [];
		const bad = leftOut.get(row);
		const i = bad ? -1 : indexOf(parsed.rowNumbers, row);
		const cells = (bad ? bad.cells : parsed.rows[i]).map((c) => (typeof c === 'string' ? clipForMessage(c) : c));
		let marks: (string | null)[] | null = null;
		for (const e of issues) {
			const j = e.column !== undefined ? columnIndex.get(e.column) : undefined;
			if (j === undefined || bad) continue;
			marks ??= parsed.columns.map(() => null);
			marks[j] = shortProblem(e);
		}
		const before = k === 0 ? 0 : dataRowsBefore(rows[k - 1]) + 1;
		return {
			row,
			cells,
			bad: marks,
			problems: issues.map((e) => e.message),
			leftOut: bad !== undefined,
			gapBefore: dataRowsBefore(row) > before
		};
	});
}

/** `row 5, column "eta": the cell is empty` → `the cell is empty` */
function shortProblem(e: ValidationIssue): string {
	const prefix = `row ${e.row}, column "${e.column}": `;
	return e.message.startsWith(prefix) ? e.message.slice(prefix.length) : e.message;
}

/** Position of `v` in the ascending array, or -1. */
function indexOf(sorted: readonly number[], v: number): number {
	const i = lowerBound(sorted, v);
	return sorted[i] === v ? i : -1;
}

/** How many items of the ascending array are below `v`. */
function lowerBound(sorted: readonly number[], v: number): number {
	let lo = 0;
	let hi = sorted.length;
	while (lo < hi) {
		const mid = (lo + hi) >>> 1;
		if (sorted[mid] < v) lo = mid + 1;
		else hi = mid;
	}
	return lo;
}
