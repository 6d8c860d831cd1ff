import Papa from 'papaparse';
import { buildTable, type RawRecord } from './buildTable';
import { DatasetError, MAX_ERROR_DETAILS } from './datasetError';
import { clipForMessage, MAX_ROWS } from './limits';
import { MAX_LISTED_PROBLEMS } from './problemReport';
import { rowList } from './rowList';
import { toCell } from './parseNumber';
import type { Cell, ErrorDetail, ParsedTable } from './types';

const CANDIDATES = [',', ';', '\t', '|'];
// Rows read to guess the delimiter; enough to outvote a stray title line.
const SNIFF_LINES = 100;
// Header and units rows come on top of the data rows.
const MAX_RECORDS = MAX_ROWS + 2;

interface DelimitedOptions {
	/** use this delimiter instead of detecting one */
	delimiter?: string;
	/** what the file name promises: ',' for .csv, tab for .tsv */
	expected?: string;
	notes?: string[];
	warnings?: string[];
}

/** CSV or TSV text → ParsedTable, through papaparse. */
export function parseDelimited(text: string, options: DelimitedOptions = {}): ParsedTable {
	const notes = options.notes ?? [];
	const warnings = options.warnings ?? [];
	if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
	if (text.trim() === '') throw new DatasetError('empty', 'the file is empty');

	let delimiter = options.delimiter;
	if (delimiter === undefined) {
		const found = detectDelimiter(text, options.expected ?? ',');
		delimiter = found ?? options.expected ?? ',';
		if (found === null) notes.push('no delimiter was found, so the table has a single column');
		else if (options.expected !== undefined && found !== options.expected) {
			notes.push(`columns are separated by ${showDelimiter(found)}, not ${showDelimiter(options.expected)}`);
		}
	}

	const records: RawRecord[] = [];
	const blankRows: number[] = [];
	const quoteProblems: ErrorDetail[] = [];
	let recordNumber = 0;
	let truncated = false;
	Papa.parse<string[]>(text, {
		delimiter,
		step(result, parser) {
			recordNumber++;
			for (const e of result.errors) {
				if (e.type === 'Quotes') quoteProblems.push({ row: recordNumber, problem: quoteProblem(e.code) });
			}
			const fields = result.data;
			const cells: Cell[] = new Array(fields.length);
			let blank = true;
			for (let j = 0; j < fields.length; j++) {
				const cell = toCell(fields[j]);
				if (cell !== null) blank = false;
				cells[j] = cell;
			}
			if (blank) {
				blankRows.push(recordNumber);
				return;
			}
			records.push({ row: recordNumber, cells });
			if (records.length > MAX_RECORDS) {
				truncated = true;
				parser.abort();
			}
		}
	});

	if (quoteProblems.length > 0) {
		throw new DatasetError(
			'malformed-quotes',
			`${rowList(quoteProblems.map((p) => p.row!))} ${quoteProblems.length === 1 ? 'has' : 'have'} a badly quoted field: ${quoteProblems[0].problem}`,
			quoteProblems
		);
	}
	if (records.length === 0) throw new DatasetError('empty', 'the file is empty');
	const { bad, width } = checkFieldCounts(records, delimiter);
	// A header with the wrong number of fields leaves no columns to read the rest into.
	if (bad.length > 0 && bad[0].row === records[0].row) throw fieldCountError(bad, delimiter, width);
	const good = bad.length > 0 ? withoutBadRows(records, bad) : records;

	const lastRow = records[records.length - 1].row;
	const inner = blankRows.filter((r) => r < lastRow && r > records[0].row);
	if (inner.length > 0) notes.push(`skipped blank ${rowList(inner)}`);

	let table: ParsedTable;
	try {
		table = buildTable(good, {
			format: delimiter === '\t' ? 'tsv' : 'csv',
			columnLabel: (j) => `column ${j + 1}`,
			notes,
			warnings,
			truncated,
			delimiter
		});
	} catch (e) {
		// every data row has the wrong number of fields: say that, not "no data rows"
		if (bad.length > 0 && e instanceof DatasetError && e.code === 'no-rows') throw fieldCountError(bad, delimiter, width);
		throw e;
	}
	if (bad.length > 0) {
		// the first few, in row order, for the report and the preview; the rest are counted
		table.badRows = bad.slice(0, MAX_LISTED_PROBLEMS).map((b) => ({
			row: b.row,
			code: b.other !== null ? 'mixed-delimiters' : 'field-count',
			problem: badRowProblem(b, delimiter, width),
			cells: b.cells.map((c) => (typeof c === 'string' ? clipForMessage(c) : c))
		}));
		table.badRowCount = bad.length;
	}
	return table;
}

/**
 * The candidate that splits the first lines into the most consistent number
 * of fields (at least two); ties go to the larger field count, then to the
 * delimiter the file name promises. Null when nothing splits the lines.
 */
function detectDelimiter(text: string, preferred = ','): string | null {
	let end = -1;
	for (let n = 0; n < SNIFF_LINES; n++) {
		end = text.indexOf('\n', end + 1);
		if (end === -1) break;
	}
	const sample = end === -1 ? text : text.slice(0, end);
	const order = [preferred, ...CANDIDATES.filter((c) => c !== preferred)];

	let best: string | null = null;
	let bestShare = 0;
	let bestWidth = 0;
	for (const candidate of order) {
		const rows = Papa.parse<string[]>(sample, { delimiter: candidate }).data.filter(
			(r) => !r.every(isBlank)
		);
		if (rows.length === 0) continue;
		const { mode, share } = modalCount(rows.map((r) => trimmedLength(r)));
		if (mode < 2) continue;
		if (share > bestShare || (share === bestShare && mode > bestWidth)) {
			best = candidate;
			bestShare = share;
			bestWidth = mode;
		}
	}
	return best;
}

interface BadRecord {
	row: number;
	count: number;
	/** the delimiter that would split the row into the table's fields, if any */
	other: string | null;
	cells: Cell[];
}

/**
 * Every record must have the table's field count (the most common one);
 * trailing empty fields are trimmed to it. Returns the records that do not
 * have it, in row order; rows that would have it when split at another
 * delimiter carry that delimiter.
 */
function checkFieldCounts(records: RawRecord[], delimiter: string): { bad: BadRecord[]; width: number } {
	const { mode: usual } = modalCount(records.map((r) => r.cells.length));
	// Trailing fields that are empty in every usual row ("1,2,3," throughout) are not columns.
	let width = 0;
	for (const r of records) {
		if (r.cells.length === usual) width = Math.max(width, trimmedLength(r.cells));
	}
	const bad: BadRecord[] = [];
	for (const record of records) {
		const cells = record.cells;
		const count = trimmedLength(cells);
		if (count <= width && cells.length >= width) {
			cells.length = width;
			continue;
		}
		bad.push({ row: record.row, count: count > width ? count : cells.length, other: otherDelimiter(cells, delimiter, width), cells });
	}
	return { bad, width };
}

function withoutBadRows(records: RawRecord[], bad: BadRecord[]): RawRecord[] {
	const rows = new Set(bad.map((b) => b.row));
	return records.filter((r) => !rows.has(r.row));
}

function badRowProblem(b: BadRecord, delimiter: string, width: number): string {
	return b.other !== null
		? `uses ${showDelimiter(b.other)} as the delimiter instead of ${showDelimiter(delimiter)}`
		: `has ${b.count} field${b.count === 1 ? '' : 's'}; the table has ${width}`;
}

/** The table cannot be read at all: its header, or every data row, has the wrong number of fields. */
function fieldCountError(bad: BadRecord[], delimiter: string, width: number): DatasetError {
	const mixed = bad.filter((b) => b.other !== null);
	const details: ErrorDetail[] = bad.slice(0, MAX_ERROR_DETAILS).map((b) => ({ row: b.row, problem: badRowProblem(b, delimiter, width) }));
	if (mixed.length > 0) {
		const others = [...new Set(mixed.map((m) => m.other!))].map(showDelimiter).join(' or ');
		return new DatasetError(
			'mixed-delimiters',
			`${rowList(mixed.map((m) => m.row))} use${mixed.length === 1 ? 's' : ''} ${others} as the delimiter but the rest of the file uses ${showDelimiter(delimiter)}; use one delimiter throughout`,
			details
		);
	}
	return new DatasetError(
		'field-count',
		`${rowList(bad.map((b) => b.row))} ${bad.length === 1 ? 'does' : 'do'} not have ${width} fields like the rest of the table (${details
			.slice(0, 3)
			.map((d) => `row ${d.row} ${d.problem.split(';')[0]}`)
			.join(', ')}${bad.length > 3 ? ', …' : ''})`,
		details
	);
}

function otherDelimiter(cells: Cell[], delimiter: string, width: number): string | null {
	const line = cells.join(delimiter);
	for (const other of CANDIDATES) {
		if (other === delimiter || !line.includes(other)) continue;
		const split = Papa.parse<string[]>(line, { delimiter: other }).data[0];
		if (split && trimmedLength(split) === width) return other;
	}
	return null;
}

function isBlank(cell: Cell): boolean {
	return cell === null || (typeof cell === 'string' && cell.trim() === '');
}

/** Field count without trailing empty fields. */
function trimmedLength(cells: readonly Cell[]): number {
	let n = cells.length;
	while (n > 0 && isBlank(cells[n - 1])) n--;
	return n;
}

/** Most common value (ties go to the first seen) and the share of items equal to it. */
function modalCount(counts: number[]): { mode: number; share: number } {
	const tally = new Map<number, number>();
	for (const c of counts) tally.set(c, (tally.get(c) ?? 0) + 1);
	let mode = counts[0];
	let best = 0;
	for (const [c, n] of tally) {
		if (n > best) {
			mode = c;
			best = n;
		}
	}
	return { mode, share: best / counts.length };
}

function quoteProblem(code: string): string {
	if (code === 'MissingQuotes') return 'a quoted field is never closed';
	if (code === 'InvalidQuotes') return 'a closing quote is followed by other characters';
	return 'a quote is out of place';
}

function showDelimiter(d: string): string {
	return d === '\t' ? 'tab' : `'${d}'`;
}
