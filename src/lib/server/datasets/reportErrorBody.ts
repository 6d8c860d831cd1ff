import type { ErrorBody, ValidationReport } from './types';

/** A failed validation report in the API's error shape (sent with 422). */
export function reportErrorBody(report: ValidationReport): ErrorBody {
	const [first] = report.errors;
	const message =
		report.errors.length === 1
			? first.message
			: `the dataset has ${report.errors.length} problems; the first: ${first?.message ?? 'none'}`;
	return {
		error: {
			code: 'invalid-dataset',
			message,
			details: report.errors.map((e) => ({
				...(e.row !== undefined ? { row: e.row } : {}),
				...(e.column !== undefined ? { column: e.column } : {}),
				problem: e.message
			}))
		}
	};
}
