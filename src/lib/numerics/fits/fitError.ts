/**
 * The one error type of the fitting engine. `code` is stable (API and UI key
 * on it); `message` is for people; `rows` lists 1-based input rows when the
 * problem sits in particular rows of the table.
 */
export type FitErrorCode =
	| 'too-few-points'
	| 'length-mismatch'
	| 'non-finite'
	| 'duplicate-x'
	| 'degree-too-high'
	| 'missing-slopes'
	| 'bad-width'
	| 'bad-option'
	| 'unknown-method'
	| 'outside-domain'
	| 'invalid-point'
	| 'bad-fit-file'
	| 'singular'
	| 'non-monotone-axis'
	| 'shape-mismatch'
	| 'too-many-inputs'
	| 'coincident-points';

export class FitError extends Error {
	readonly code: FitErrorCode;
	readonly rows?: number[];

	constructor(code: FitErrorCode, message: string, rows?: number[]) {
		super(message);
		this.name = 'FitError';
		this.code = code;
		if (rows) this.rows = rows;
	}
}

/** Short list of row numbers for a message: "3, 7, 12 and 40 more". */
export function describeRows(rows: readonly number[], limit = 10): string {
	if (rows.length <= limit) return rows.join(', ');
	return `${rows.slice(0, limit).join(', ')} and ${rows.length - limit} more`;
}
