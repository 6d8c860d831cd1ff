import ExcelJS from 'exceljs';
import { buildTable, type RawRecord } from './buildTable';
import { DatasetError } from './DatasetError';
import { expandsTooFar, MAX_EXPANDED_BYTES, MAX_ROWS, tooManyRows } from './limits';
import { zipEntrySizes } from './zipSizes';
import type { Cell, ErrorDetail, ParsedTable } from './types';

export interface WorkbookOptions {
	/** the sheet to read; by default the first one holding any data */
	sheet?: string;
	notes?: string[];
	warnings?: string[];
}

/**
 * XLSX bytes → ParsedTable through exceljs. Formula cells give their saved
 * (cached) result; a formula without one is an error, since recalculating
 * workbooks here is out of scope.
 */
export async function parseWorkbook(bytes: Uint8Array, options: WorkbookOptions = {}): Promise<ParsedTable> {
	const notes = options.notes ?? [];
	const warnings = options.warnings ?? [];
	const entries = zipEntrySizes(bytes);
	if (!entries) throw new DatasetError('unreadable-workbook', 'the file could not be read as an XLSX workbook (its ZIP directory is missing or damaged)');
	const expanded = entries.reduce((sum, e) => sum + e.size, 0);
	if (expanded > MAX_EXPANDED_BYTES) throw expandsTooFar(expanded);
	const workbook = new ExcelJS.Workbook();
	try {
		// exceljs's typings ask for a Node Buffer; this one shares the upload's memory
		await workbook.xlsx.load(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength) as never);
	} catch (e) {
		throw new DatasetError(
			'unreadable-workbook',
			`the file could not be read as an XLSX workbook (${e instanceof Error ? e.message : String(e)})`
		);
	}

	const sheets = workbook.worksheets.map((ws) => ws.name);
	const listed = sheets.map((s) => `"${s}"`).join(', ');
	let worksheet: ExcelJS.Worksheet | undefined;
	if (options.sheet !== undefined) {
		worksheet = workbook.worksheets.find((ws) => ws.name === options.sheet);
		if (!worksheet) {
			throw new DatasetError('sheet-not-found', `the workbook has no sheet "${options.sheet}"; its sheets are ${listed}`);
		}
		if (sheets.length > 1) notes.push(`used sheet "${worksheet.name}" as requested; the workbook has sheets ${listed}`);
	} else {
		worksheet = workbook.worksheets.find((ws) => ws.actualRowCount > 0);
		if (!worksheet) {
			throw new DatasetError('empty', `the workbook has no data on any sheet (sheets: ${listed || 'none'})`);
		}
		if (sheets.length > 1) {
			notes.push(`used sheet "${worksheet.name}", the first sheet with data; the workbook has sheets ${listed}`);
		}
	}
	if (worksheet.actualRowCount === 0) throw new DatasetError('empty', `sheet "${worksheet.name}" is empty`);
	// header and units rows come on top of the data rows
	if (worksheet.actualRowCount > MAX_ROWS + 2) throw tooManyRows(undefined);

	const records: RawRecord[] = [];
	const formulas: { row: number; col: number }[] = [];
	const unsaved: ErrorDetail[] = [];
	worksheet.eachRow({ includeEmpty: false }, (row, rowNumber) => {
		const cells: Cell[] = [];
		let filled = false;
		row.eachCell({ includeEmpty: false }, (cell, col) => {
			let value: Cell;
			if (cell.type === ExcelJS.ValueType.Formula) {
				formulas.push({ row: rowNumber, col });
				const result = cell.result;
				if (result === undefined || result === null) {
					unsaved.push({
						row: rowNumber,
						column: columnLetter(col - 1),
						problem: `${cell.address} holds the formula =${cell.formula} but no saved value`
					});
					value = null;
				} else {
					value = plainValue(result);
				}
			} else {
				value = plainValue(cell.value);
			}
			while (cells.length < col - 1) cells.push(null);
			cells[col - 1] = value;
			if (value !== null && !(typeof value === 'string' && value.trim() === '')) filled = true;
		});
		if (filled) records.push({ row: rowNumber, cells });
	});

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
	if (records.length === 0) throw new DatasetError('empty', `sheet "${worksheet.name}" is empty`);
	if (formulas.length > 0) {
		notes.push(
			`${formulas.length === 1 ? '1 cell is a formula; its' : `${formulas.length} cells are formulas; their`} saved value${formulas.length === 1 ? ' was' : 's were'} used: ${cellRanges(formulas)}`
		);
	}

	return buildTable(records, {
		format: 'xlsx',
		columnLabel: (j) => `column ${columnLetter(j)}`,
		notes,
		warnings,
		sheet: worksheet.name,
		sheets
	});
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
