import { Readable } from 'node:stream';
import ExcelJS from 'exceljs';
import { buildTable, type RawRecord } from './buildTable';
import { DatasetError } from './datasetError';
import { expandsTooFar, MAX_COLUMNS, MAX_EXPANDED_BYTES, MAX_ROWS, tooManyColumns, tooManyRows } from './limits';
import { zipEntrySizes } from './zipSizes';
import type { Cell, ErrorDetail, ParsedTable } from './types';

interface WorkbookOptions {
	/** the sheet to read; by default the first one holding any data */
	sheet?: string;
	notes?: string[];
	warnings?: string[];
}

/**
 * Farthest column a cell may sit in (column IV). With at most MAX_COLUMNS used
 * columns a table never needs more; the bound keeps a stray cell in column XFD
 * from making every row 16,384 cells wide.
 */
const MAX_COLUMN_INDEX = 256;

/** One sheet row as read: the columns (1-based) and values of its non-empty cells. */
interface SparseRow {
	row: number;
	cols: number[];
	values: Cell[];
}

interface SheetRead {
	name: string;
	/** position in the workbook's own sheet order */
	order: number;
	rows: SparseRow[];
	/** used (non-blank) columns, 1-based */
	used: Set<number>;
	formulas: { row: number; col: number }[];
	unsaved: ErrorDetail[];
}

const blank = (v: Cell) => v === null || (typeof v === 'string' && v.trim() === '');

// exceljs's reader exposes the workbook model it has read so far; its typings do not
type ReaderModel = { model?: { sheets?: { name: string; id: number }[] } };

/**
 * XLSX bytes → ParsedTable through exceljs's streaming reader. The workbook is
 * refused from its ZIP directory when its parts would expand past
 * MAX_EXPANDED_BYTES; otherwise sheet rows are read one by one and reading stops
 * the moment the row limit, the column limit or MAX_COLUMN_INDEX is passed, so a
 * workbook that lies about its sizes never gets further than the limits allow.
 * Formula cells give their saved (cached) result; a formula without one is an
 * error, since recalculating workbooks here is out of scope.
 */
export async function parseWorkbook(bytes: Uint8Array, options: WorkbookOptions = {}): Promise<ParsedTable> {
	const notes = options.notes ?? [];
	const warnings = options.warnings ?? [];
	const entries = zipEntrySizes(bytes);
	if (!entries) throw new DatasetError('unreadable-workbook', 'the file could not be read as an XLSX workbook (its ZIP directory is missing or damaged)');
	const expanded = entries.reduce((sum, e) => sum + e.size, 0);
	if (expanded > MAX_EXPANDED_BYTES) throw expandsTooFar(expanded);

	const input = Readable.from([Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength)]);
	const reader = new ExcelJS.stream.xlsx.WorkbookReader(input, {
		sharedStrings: 'cache',
		styles: 'cache', // number formats tell dates from numbers
		hyperlinks: 'ignore',
		worksheets: 'emit',
		entries: 'ignore'
	});
	let chosen: SheetRead | null = null;
	let seen = 0;
	try {
		for await (const sheetReader of reader) {
			seen++;
			const sheetModel = (reader as unknown as ReaderModel).model?.sheets ?? [];
			const name: string = (sheetReader as unknown as { name?: string }).name ?? `sheet ${seen}`;
			const order = Math.max(0, sheetModel.findIndex((m) => m.name === name));
			const wanted = options.sheet === undefined ? chosen === null || order < chosen.order : name === options.sheet;
			if (!wanted) {
				for await (const row of sheetReader) void row; // read past it: the entry must be consumed
				continue;
			}
			const read = await readSheet(sheetReader, name, order);
			if (read.rows.length > 0 || options.sheet !== undefined) chosen = read;
		}
	} catch (e) {
		if (e instanceof DatasetError) throw e;
		// a TypeError comes from inside the reader, on XML it does not expect; its own words would not help
		const why =
			e instanceof TypeError
				? 'a sheet is written in a form this reader does not take, such as cells without an address; open it in a spreadsheet program, save it and upload it again'
				: e instanceof Error
					? e.message
					: String(e);
		throw new DatasetError('unreadable-workbook', `the file could not be read as an XLSX workbook (${why})`);
	} finally {
		input.destroy();
	}

	const sheets = ((reader as unknown as ReaderModel).model?.sheets ?? []).map((m) => m.name);
	const listed = sheets.map((s) => `"${s}"`).join(', ');
	if (options.sheet !== undefined) {
		if (!chosen) throw new DatasetError('sheet-not-found', `the workbook has no sheet "${options.sheet}"; its sheets are ${listed}`);
		if (sheets.length > 1) notes.push(`used sheet "${chosen.name}" as requested; the workbook has sheets ${listed}`);
	} else {
		if (!chosen) throw new DatasetError('empty', `the workbook has no data on any sheet (sheets: ${listed || 'none'})`);
		if (sheets.length > 1) notes.push(`used sheet "${chosen.name}", the first sheet with data; the workbook has sheets ${listed}`);
	}
	const { rows, formulas, unsaved } = chosen;

	if (unsaved.length > 0) {
		throw new DatasetError(
			'formula-without-value',
			`${unsaved.length === 1 ? 'a formula cell has' : `${unsaved.length} formula cells have`} no saved value (${unsaved
				.slice(0, 5)
				.map((d) => d.problem.split(' ')[0])
				.join(', ')}${unsaved.length > 5 ? ', …' : ''}); open the workbook in a spreadsheet program, let it calculate, save it and upload it again`,
			unsaved
		);
	}
	if (rows.length === 0) throw new DatasetError('empty', `sheet "${chosen.name}" is empty`);
	if (formulas.length > 0) {
		notes.push(
			`${formulas.length === 1 ? '1 cell is a formula; its' : `${formulas.length} cells are formulas; their`} saved value${formulas.length === 1 ? ' was' : 's were'} used: ${cellRanges(formulas)}`
		);
	}

	// dense records over the columns that hold anything; the empty ones between are named in a note
	const present = new Set<number>();
	for (const r of rows) for (const c of r.cols) present.add(c);
	const columns = [...present].sort((a, b) => a - b);
	const gaps: string[] = [];
	for (let c = 1, k = 0; c <= columns[columns.length - 1]; c++) {
		if (columns[k] === c) k++;
		else gaps.push(`column ${columnLetter(c - 1)}`);
	}
	if (gaps.length > 0) notes.push(`ignored ${gaps.length === 1 ? 'an empty column' : 'empty columns'}: ${gaps.length > 12 ? `${gaps.slice(0, 12).join(', ')}, … (${gaps.length} columns)` : gaps.join(', ')}`);
	const slot = new Map(columns.map((c, k) => [c, k]));
	// each sparse row is let go as soon as its dense record exists, so the two never both hold the whole sheet
	const records: RawRecord[] = new Array(rows.length);
	for (let k = 0; k < rows.length; k++) {
		const r = rows[k];
		const cells: Cell[] = new Array(columns.length).fill(null);
		for (let i = 0; i < r.cols.length; i++) cells[slot.get(r.cols[i])!] = r.values[i];
		records[k] = { row: r.row, cells };
		(rows as (SparseRow | null)[])[k] = null;
	}

	return buildTable(records, {
		format: 'xlsx',
		columnLabel: (j) => `column ${columnLetter(columns[j] - 1)}`,
		notes,
		warnings,
		sheet: chosen.name,
		sheets
	});
}

/** Every row of one sheet, stopping with a 413-class error the moment a limit is passed. */
async function readSheet(sheetReader: AsyncIterable<ExcelJS.Row>, name: string, order: number): Promise<SheetRead> {
	const read: SheetRead = { name, order, rows: [], used: new Set(), formulas: [], unsaved: [] };
	for await (const row of sheetReader) {
		const cols: number[] = [];
		const values: Cell[] = [];
		let filled = false;
		row.eachCell({ includeEmpty: false }, (cell, col) => {
			let value: Cell;
			if (cell.type === ExcelJS.ValueType.Formula) {
				read.formulas.push({ row: row.number, col });
				const result = cell.result;
				if (result === undefined || result === null) {
					read.unsaved.push({ row: row.number, column: columnLetter(col - 1), problem: `${cell.address} holds the formula =${cell.formula} but no saved value` });
					value = null;
				} else if (typeof result === 'number' && Number.isNaN(result)) {
					// the streaming reader reads a saved error (#DIV/0!, #N/A…) as NaN and drops its name
					value = `an error (=${cell.formula})`;
				} else {
					value = plainValue(result);
				}
			} else {
				value = plainValue(cell.value);
			}
			if (value === null) return;
			if (!blank(value)) {
				if (col > MAX_COLUMN_INDEX) {
					throw new DatasetError(
						'too-many-columns',
						`cell ${cell.address} on sheet "${name}" lies beyond column ${columnLetter(MAX_COLUMN_INDEX - 1)}; a table uses at most ${MAX_COLUMNS} columns within the first ${MAX_COLUMN_INDEX} (move or delete the far cells)`,
						[{ row: row.number, column: columnLetter(col - 1), problem: `beyond column ${columnLetter(MAX_COLUMN_INDEX - 1)}` }]
					);
				}
				read.used.add(col);
				if (read.used.size > MAX_COLUMNS) throw tooManyColumns(undefined);
				filled = true;
			}
			cols.push(col);
			values.push(value);
		});
		if (!filled) continue;
		read.rows.push({ row: row.number, cols, values });
		// header and units rows come on top of the data rows
		if (read.rows.length > MAX_ROWS + 2) throw tooManyRows(undefined);
	}
	return read;
}

/** A cell value or formula result as a plain cell. Dates, booleans and errors become text, so validation reports them. */
function plainValue(value: unknown): Cell {
	if (value === null || value === undefined) return null;
	if (typeof value === 'number') return value;
	if (typeof value === 'string') return value;
	if (typeof value === 'boolean') return value ? 'TRUE' : 'FALSE';
	if (value instanceof Date) return value.toISOString();
	if (typeof value === 'object') {
		const v = value as Record<string, unknown>;
		if (Array.isArray(v.richText)) return v.richText.map((t: { text?: string }) => t.text ?? '').join('');
		if (typeof v.error === 'string') return v.error;
		if (typeof v.text === 'string') return v.text;
		if ('result' in v) return plainValue(v.result);
	}
	return String(value);
}

/** 0 → "A", 25 → "Z", 26 → "AA". */
export function columnLetter(index: number): string {
	let s = '';
	for (let n = index + 1; n > 0; n = Math.floor((n - 1) / 26)) s = String.fromCharCode(65 + ((n - 1) % 26)) + s;
	return s;
}

/** Cell addresses compressed into column runs: "C2:C13, E4"; at most `max` runs listed. */
function cellRanges(cells: { row: number; col: number }[], max = 10): string {
	const sorted = [...cells].sort((a, b) => a.col - b.col || a.row - b.row);
	const runs: string[] = [];
	let start = sorted[0];
	let prev = sorted[0];
	const close = () => {
		const c = columnLetter(start.col - 1);
		runs.push(start.row === prev.row ? `${c}${start.row}` : `${c}${start.row}:${c}${prev.row}`);
	};
	for (let i = 1; i < sorted.length; i++) {
		const cur = sorted[i];
		if (cur.col === prev.col && cur.row === prev.row + 1) {
			prev = cur;
			continue;
		}
		close();
		start = prev = cur;
	}
	close();
	return runs.length > max ? `${runs.slice(0, max).join(', ')}, … (${runs.length} ranges)` : runs.join(', ');
}
