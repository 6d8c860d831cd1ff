import { DatasetError } from './datasetError';

export const MAX_FILE_BYTES = 20 * 1024 * 1024;
export const MAX_ROWS = 1_000_000;
export const MAX_COLUMNS = 32;
/**
 * Largest expanded size of a workbook's parts (sheets, shared strings, styles…)
 * as its ZIP directory declares them. A million rows of a few numbers is well
 * under this; a decompression bomb (a small file expanding to gigabytes) is
 * refused before anything is inflated.
 */
export const MAX_EXPANDED_BYTES = 96 * 1024 * 1024;
/** Heap a table-reading thread may use; a workbook that lies about its sizes dies here, not in the server. */
export const PARSE_HEAP_MB = 1536;

const MB = 1024 * 1024;

/** "21.3 MB", "20 MB" — binary megabytes, as file browsers show them. */
export function formatMegabytes(bytes: number): string {
	const mb = bytes / MB;
	const text = Number.isInteger(mb) ? String(mb) : mb.toFixed(1);
	return `${text} MB`;
}

export function formatCount(n: number): string {
	return n.toLocaleString('en-US');
}

/** `size` undefined means "stopped reading past the limit, true size unknown". */
export function fileTooLarge(size: number | undefined, max = MAX_FILE_BYTES): DatasetError {
	const what = size === undefined ? `more than ${formatMegabytes(max)}` : formatMegabytes(size);
	return new DatasetError('file-too-large', `file is ${what}; the limit is ${formatMegabytes(max)}`);
}

/** `count` undefined means "reading stopped past the limit". */
export function tooManyRows(count: number | undefined, max = MAX_ROWS): DatasetError {
	const what = count === undefined ? `more than ${formatCount(max)}` : formatCount(count);
	return new DatasetError('too-many-rows', `table has ${what} rows; the limit is ${formatCount(max)} rows`);
}

/** `count` undefined means "reading stopped past the limit". */
export function tooManyColumns(count: number | undefined, max = MAX_COLUMNS): DatasetError {
	const what = count === undefined ? `more than ${max}` : String(count);
	return new DatasetError('too-many-columns', `table has ${what} columns; the limit is ${max} columns`);
}

export function expandsTooFar(size: number, max = MAX_EXPANDED_BYTES): DatasetError {
	const what = Number.isFinite(size) ? formatMegabytes(size) : 'an undeclared (ZIP64) size';
	return new DatasetError('expands-too-far', `the workbook expands to ${what} of sheet data; the limit is ${formatMegabytes(max)} (save the sheet as CSV, or split it)`);
}

/** Longest column name (with its unit) a table may have. */
export const MAX_COLUMN_NAME = 200;
/** Longest piece of a user's cell that an error message quotes back. */
const MAX_QUOTED = 80;

/** A user's text as an error message may quote it: at most MAX_QUOTED characters, the rest counted. */
export function clipForMessage(text: string, max = MAX_QUOTED): string {
	if (text.length <= max) return text;
	return `${text.slice(0, max)}… (${formatCount(text.length)} characters)`;
}
