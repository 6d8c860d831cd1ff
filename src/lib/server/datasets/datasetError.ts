import type { ErrorBody, ErrorDetail } from './types';

/** Codes for problems that stop a table from being read at all. */
export type DatasetErrorCode =
	| 'empty'
	| 'not-text'
	| 'no-rows'
	| 'mixed-delimiters'
	| 'field-count'
	| 'malformed-quotes'
	| 'file-too-large'
	| 'too-many-rows'
	| 'too-many-columns'
	| 'expands-too-far'
	| 'column-name-too-long'
	| 'over-budget'
	| 'formula-without-value'
	| 'sheet-not-found'
	| 'unreadable-workbook'
	| 'unsupported-format'
	| 'invalid-body';

const LIMIT_CODES: ReadonlySet<DatasetErrorCode> = new Set([
	'file-too-large',
	'too-many-rows',
	'too-many-columns',
	'expands-too-far',
	'over-budget'
]);

/** Details kept on an error; more would only bloat the response. */
export const MAX_ERROR_DETAILS = 100;

/**
 * A table that cannot be read. Thrown by the parsers and the JSON body check;
 * `body()` gives the API error shape and `status` the HTTP status to send.
 */
export class DatasetError extends Error {
	readonly code: DatasetErrorCode;
	readonly details: ErrorDetail[];
	/** 413 for limits, 422 for everything else */
	readonly status: 413 | 422;

	constructor(code: DatasetErrorCode, message: string, details: ErrorDetail[] = []) {
		super(message);
		this.name = 'DatasetError';
		this.code = code;
		this.details = details.slice(0, MAX_ERROR_DETAILS);
		this.status = LIMIT_CODES.has(code) ? 413 : 422;
	}

	body(): ErrorBody {
		return {
			error: {
				code: this.code,
				message: this.message,
				...(this.details.length ? { details: this.details } : {})
			}
		};
	}
}
