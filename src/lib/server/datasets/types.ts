/**
 * Shapes shared by the dataset parsers and the validator. A parsed table is
 * still raw (cells as read); only validateTable turns cells into numbers.
 */

export type Role = 'input' | 'output';

export type Shape = 'curve' | 'grid' | 'scatter';

/**
 * One cell as read, trimmed: a number when the file held a plain decimal
 * number (or a numeric XLSX/JSON value), otherwise the text; null when empty.
 */
export type Cell = string | number | null;

export interface ParsedColumn {
	name: string;
	/** as written in the file (`-`, `rpm`, `N·m`); null when none was given */
	unit: string | null;
	/** set by the JSON body; files leave roles to validateTable */
	role?: Role;
}

export interface ParsedTable {
	format: 'csv' | 'tsv' | 'xlsx' | 'json';
	columns: ParsedColumn[];
	/** data rows only, each exactly columns.length long */
	rows: Cell[][];
	/**
	 * Records left out of `rows` because they do not have the table's number of
	 * fields (CSV/TSV): the first of them in row order, with their cells as read
	 * (long texts clipped), so the check can report them beside the cell
	 * problems of the rest and the preview can show them.
	 */
	badRows?: BadRow[];
	/** how many records were left out in all (badRows may list fewer) */
	badRowCount?: number;
	/**
	 * rowNumbers[i] is the number the user sees for rows[i]: 1-based, counting
	 * the header and units rows (the record number in CSV/TSV, the sheet row in
	 * XLSX, the position in `rows` for JSON bodies).
	 */
	rowNumbers: number[];
	hasHeader: boolean;
	delimiter?: string;
	sheet?: string;
	sheets?: string[];
	/** facts the user should know about how the file was read */
	notes: string[];
	/** things that were read but look wrong */
	warnings: string[];
}

interface BadRow {
	/** the row number the user sees */
	row: number;
	code: 'field-count' | 'mixed-delimiters';
	/** "has 2 fields; the table has 3" */
	problem: string;
	cells: Cell[];
}

export interface ValidationIssue {
	code: string;
	message: string;
	row?: number;
	column?: string;
	value?: string;
}

export interface ValidationReport {
	ok: boolean;
	/** null when the inputs are not all numbers, so no shape can be told */
	shape: Shape | null;
	shapeReason: string;
	columns: { name: string; unit: string | null; role: Role }[];
	rowCount: number;
	/** in the order problemReport gives: table-wide first, then row by row; bounded, with an "and N more" note */
	errors: ValidationIssue[];
	/** every problem found, listed or not (0 when ok) */
	problemCount: number;
	warnings: string[];
	notes: string[];
	/** one array per column, in column order; present only when ok */
	data?: Float64Array[];
}

/** One item of the API error shape's `details`. */
export interface ErrorDetail {
	row?: number;
	column?: string;
	field?: string;
	problem: string;
}

/** The API's one error shape. */
export interface ErrorBody {
	error: { code: string; message: string; details?: ErrorDetail[] };
}
