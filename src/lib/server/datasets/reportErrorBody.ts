import { formatCount } from './limits';
import { MORE_PROBLEMS } from './problemReport';
import type { ErrorBody, ErrorDetail, ValidationIssue, ValidationReport } from './types';

/** A report's problems as the API's error details: row and column where a problem has them, always the problem. */
export function issueDetails(errors: readonly ValidationIssue[]): ErrorDetail[] {
	return errors.map((e) => ({
		...(e.row !== undefined ? { row: e.row } : {}),
		...(e.column !== undefined ? { column: e.column } : {}),
		problem: e.message
	}));
}

/**
 * A failed validation report in the API's error shape (sent with 422): every
 * problem in the report's order (table-wide, then row by row), up to the
 * report's bound, the last detail saying how many more there are.
 */
export function reportErrorBody(report: ValidationReport): ErrorBody {
	const [first] = report.errors;
	const count = Math.max(report.problemCount, report.errors.filter((e) => e.code !== MORE_PROBLEMS).length);
	const listed = report.errors.filter((e) => e.code !== MORE_PROBLEMS).length;
	const message =
		count === 1
			? first.message
			: `the dataset has ${formatCount(count)} problems${listed < count ? ` (the first ${formatCount(listed)} are listed)` : ''}; the first: ${first?.message ?? 'none'}`;
	return {
		error: {
			code: 'invalid-dataset',
			message,
			details: issueDetails(report.errors)
		}
	};
}
