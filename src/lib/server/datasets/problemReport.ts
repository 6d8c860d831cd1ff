import { formatCount } from './limits';
import type { ValidationIssue } from './types';

/** Problems a report lists one by one; past this a note counts the rest. */
export const MAX_LISTED_PROBLEMS = 100;

/** Codes of problems about a whole row (it could not be read into the columns). */
const ROW_CODES: ReadonlySet<string> = new Set(['field-count', 'mixed-delimiters']);

export const MORE_PROBLEMS = 'more-problems';

/**
 * What an unlisted problem is counted under in the "and N more" note: rows
 * with the wrong number of fields, a column's cells, or other problems.
 */
export function problemGroup(issue: Pick<ValidationIssue, 'code' | 'column'>): string {
	if (ROW_CODES.has(issue.code)) return 'rows with the wrong number of fields';
	if (issue.column !== undefined) return `in column "${issue.column}"`;
	return 'other problems';
}

interface OrderedProblems {
	/** table-wide problems first, then row by row; at most `max` of the row problems, then one note */
	listed: ValidationIssue[];
	/** every problem found, listed or not */
	count: number;
}

/**
 * The problems of an upload in the order a person fixes them: problems of the
 * whole table (a missing input, a duplicated column name) first, then row by
 * row as the file runs, and within a row the row itself (wrong number of
 * fields), then its cells left to right, then problems between rows.
 *
 * Row problems past `max` are counted, not listed, in one closing note that
 * says how many are left in each group. `uncollected` counts problems the
 * checks found but did not keep (each check keeps only its first `max`, in
 * row order, so the first `max` of all are always among those kept), by the
 * group problemGroup gives.
 */
export function orderProblems(
	issues: readonly ValidationIssue[],
	columns: readonly string[],
	uncollected: ReadonlyMap<string, number> = new Map(),
	max = MAX_LISTED_PROBLEMS
): OrderedProblems {
	const whole: ValidationIssue[] = [];
	const byRow: { issue: ValidationIssue; rank: number; seq: number }[] = [];
	const columnIndex = new Map<string, number>();
	columns.forEach((name, j) => {
		if (!columnIndex.has(name)) columnIndex.set(name, j);
	});
	issues.forEach((issue, seq) => {
		if (issue.row === undefined) {
			whole.push(issue);
			return;
		}
		// the row itself, then its cells in column order, then problems between rows (repeated inputs)
		const rank = ROW_CODES.has(issue.code) ? -1 : issue.column !== undefined ? (columnIndex.get(issue.column) ?? columns.length) : columns.length + 1;
		byRow.push({ issue, rank, seq });
	});
	byRow.sort((a, b) => a.issue.row! - b.issue.row! || a.rank - b.rank || a.seq - b.seq);

	const shown = byRow.slice(0, max).map((b) => b.issue);
	const left = new Map<string, number>();
	for (const b of byRow.slice(max)) {
		const g = problemGroup(b.issue);
		left.set(g, (left.get(g) ?? 0) + 1);
	}
	for (const [g, n] of uncollected) if (n > 0) left.set(g, (left.get(g) ?? 0) + n);
	let unlisted = 0;
	for (const n of left.values()) unlisted += n;

	const listed = [...whole, ...shown];
	if (unlisted > 0) {
		// groups in the table's order: rows, then columns left to right, then the rest
		const order = [problemGroup({ code: 'field-count' }), ...columns.map((c) => problemGroup({ code: 'cell', column: c })), problemGroup({ code: 'other' })];
		const at = (g: string) => (order.indexOf(g) === -1 ? order.length : order.indexOf(g));
		const parts = [...left].sort((a, b) => at(a[0]) - at(b[0])).map(([g, n]) => `${formatCount(n)} ${g}`);
		listed.push({
			code: MORE_PROBLEMS,
			message: `and ${formatCount(unlisted)} more problem${unlisted === 1 ? '' : 's'} not listed (${parts.join('; ')}); fix the ones above and check again to see them`
		});
	}
	return { listed, count: whole.length + byRow.length + [...uncollected.values()].reduce((s, n) => s + n, 0) };
}
