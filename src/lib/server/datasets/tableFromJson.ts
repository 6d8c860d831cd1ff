import type { z } from 'zod';
import { datasetJsonSchema, type DatasetJson } from './datasetJsonSchema';
import { DatasetError, MAX_ERROR_DETAILS } from './datasetError';
import { MAX_COLUMNS, MAX_ROWS, tooManyColumns, tooManyRows } from './limits';
import type { ErrorDetail, ParsedTable } from './types';

/**
 * A checked JSON body → the same ParsedTable the file parsers give, so both
 * paths meet in validateTable. Row numbers are positions in `rows`, from 1.
 */
export function tableFromJson(json: DatasetJson): ParsedTable {
	return {
		format: 'json',
		columns: json.columns.map((c) => ({ name: c.name, unit: c.unit ?? null, role: c.role })),
		rows: json.rows,
		rowNumbers: json.rows.map((_, i) => i + 1),
		hasHeader: true,
		notes: [],
		warnings: []
	};
}

/**
 * Checks an untrusted JSON body against datasetJsonSchema and converts it.
 * Throws DatasetError: the limit errors (413) for too many rows or columns,
 * `invalid-body` (422) naming the row, column or field of each problem.
 */
export function parseDatasetJson(body: unknown): { name: string; table: ParsedTable } {
	// Checked before the schema walks a million rows just to reject them.
	if (body !== null && typeof body === 'object') {
		const { rows, columns } = body as { rows?: unknown; columns?: unknown };
		if (Array.isArray(rows) && rows.length > MAX_ROWS) throw tooManyRows(rows.length);
		if (Array.isArray(columns) && columns.length > MAX_COLUMNS) throw tooManyColumns(columns.length);
	}
	const result = datasetJsonSchema.safeParse(body);
	if (!result.success) {
		const columns = (body as { columns?: { name?: unknown }[] } | null)?.columns;
		const details = result.error.issues.slice(0, MAX_ERROR_DETAILS).map((issue) => issueDetail(issue, columns));
		const first = details[0];
		const where = first.row !== undefined ? '' : first.field ? `${first.field}: ` : '';
		const more = result.error.issues.length > 1 ? ` (and ${result.error.issues.length - 1} more problems)` : '';
		throw new DatasetError('invalid-body', `${where}${first.problem}${more}`, details);
	}
	return { name: result.data.name, table: tableFromJson(result.data) };
}

function issueDetail(issue: z.core.$ZodIssue, columns: { name?: unknown }[] | undefined): ErrorDetail {
	const [head, i, j] = issue.path;
	if (head === 'rows' && typeof i === 'number') {
		const detail: ErrorDetail = { row: i + 1, problem: issue.message };
		if (typeof j === 'number') {
			const name = Array.isArray(columns) ? columns[j]?.name : undefined;
			detail.column = typeof name === 'string' ? name : `column ${j + 1}`;
			detail.problem = `row ${i + 1}, column "${detail.column}": ${issue.message}`;
		}
		return detail;
	}
	const field = issue.path.map((p, k) => (typeof p === 'number' ? `[${p}]` : k === 0 ? String(p) : `.${String(p)}`)).join('');
	return { ...(field ? { field } : {}), problem: issue.message };
}
