import { DatasetError } from './datasetError';
import { controlCharacterIn } from '../../text';
import { clipForMessage, formatCount, MAX_COLUMN_NAME, MAX_COLUMNS, MAX_ROWS, tooManyColumns, tooManyRows } from './limits';
import { parseNumber } from './parseNumber';
import type { Cell, ParsedColumn, ParsedTable } from './types';

/** One non-blank record of a file: its row number as the user sees it and its cells. */
export interface RawRecord {
	row: number;
	cells: Cell[];
}

interface BuildOptions {
	format: ParsedTable['format'];
	/** how the user names the i-th column of the file: "column 3", "column C" */
	columnLabel: (index: number) => string;
	notes?: string[];
	warnings?: string[];
	/** reading stopped early because there were more records than the row limit allows */
	truncated?: boolean;
	delimiter?: string;
	sheet?: string;
	sheets?: string[];
}

// A units row holds short tokens such as "-", "rpm", "N·m", "kg/m³", "%".
const MAX_UNIT_LENGTH = 24;
// "name [unit]" or "name (unit)" at the end of a header cell.
const NAME_WITH_UNIT = /^(.*?)\s*(?:\[([^[\]]*)\]|\(([^()]*)\))$/;

/**
 * Records read from CSV, TSV or a sheet → ParsedTable: drops empty columns,
 * finds the header and a units row, applies the row and column limits.
 */
export function buildTable(records: RawRecord[], options: BuildOptions): ParsedTable {
	const notes = options.notes ?? [];
	const warnings = options.warnings ?? [];
	if (records.length === 0) throw new DatasetError('empty', 'the file is empty');

	const width = widthOf(records);
	const keep = usedColumns(records, width);
	if (keep.length < width) {
		const kept = new Set(keep);
		const dropped: string[] = [];
		for (let j = 0; j < width; j++) if (!kept.has(j)) dropped.push(options.columnLabel(j));
		notes.push(`ignored ${dropped.length === 1 ? 'an empty column' : 'empty columns'}: ${dropped.join(', ')}`);
	}
	if (keep.length > MAX_COLUMNS) throw tooManyColumns(keep.length);
	const pick = (cells: Cell[]): Cell[] => keep.map((j) => blankToNull(cells[j]));

	const first = pick(records[0].cells);
	const hasHeader = looksLikeHeader(first);
	let columns: ParsedColumn[];
	let dataStart = 0;
	if (hasHeader) {
		dataStart = 1;
		columns = first.map((cell, i) => {
			const text = cell === null ? '' : String(cell);
			if (text === '') {
				const name = `col${i + 1}`;
				warnings.push(`${options.columnLabel(keep[i])} has no name in the header; it is called ${name}`);
				return { name, unit: null };
			}
			const control = controlCharacterIn(text);
			if (control) {
				throw new DatasetError('invalid-body', `${options.columnLabel(keep[i])}'s header contains a control character (${control}); remove it`, [
					{ row: records[0].row, column: options.columnLabel(keep[i]), problem: `control character in the header (${control})` }
				]);
			}
			if (text.length > MAX_COLUMN_NAME) {
				throw new DatasetError(
					'column-name-too-long',
					`${options.columnLabel(keep[i])} has a header of ${formatCount(text.length)} characters ("${clipForMessage(text, 40)}"); the limit is ${MAX_COLUMN_NAME}`,
					[{ row: records[0].row, column: options.columnLabel(keep[i]), problem: `header longer than ${MAX_COLUMN_NAME} characters` }]
				);
			}
			return splitNameAndUnit(text);
		});
		if (records.length > 1 && columns.some((c) => c.unit === null)) {
			const second = pick(records[1].cells);
			if (looksLikeUnitsRow(second)) {
				dataStart = 2;
				applyUnitsRow(columns, second, warnings);
				notes.push(`row ${records[1].row} was read as units: ${second.map((u) => u ?? '(none)').join(', ')}`);
			}
		}
	} else {
		columns = first.map((_, i) => ({ name: `col${i + 1}`, unit: null }));
		notes.push(`the first row holds numbers, so it was read as data; columns are named col1…col${columns.length}`);
	}

	const dataCount = records.length - dataStart;
	if (dataCount === 0) {
		throw new DatasetError(
			'no-rows',
			`the table has a header (${columns.map((c) => c.name).join(', ')}) but no data rows`
		);
	}
	if (dataCount > MAX_ROWS) throw tooManyRows(options.truncated ? undefined : dataCount);

	const rows: Cell[][] = new Array(dataCount);
	const rowNumbers: number[] = new Array(dataCount);
	for (let i = 0; i < dataCount; i++) {
		const record = records[dataStart + i];
		rows[i] = pick(record.cells);
		rowNumbers[i] = record.row;
	}

	return {
		format: options.format,
		columns,
		rows,
		rowNumbers,
		hasHeader,
		...(options.delimiter !== undefined ? { delimiter: options.delimiter } : {}),
		...(options.sheet !== undefined ? { sheet: options.sheet } : {}),
		...(options.sheets !== undefined ? { sheets: options.sheets } : {}),
		notes,
		warnings
	};
}

/** "Torque [N·m]" → { name: "Torque", unit: "N·m" }; "eta (-)" → { name: "eta", unit: "-" }. */
function splitNameAndUnit(header: string): ParsedColumn {
	const m = NAME_WITH_UNIT.exec(header);
	if (!m || m[1].trim() === '') return { name: header, unit: null };
	const unit = (m[2] ?? m[3]).trim();
	return { name: m[1].trim(), unit: unit === '' ? null : unit };
}

function widthOf(records: RawRecord[]): number {
	let width = 0;
	for (const r of records) if (r.cells.length > width) width = r.cells.length;
	return width;
}

/** Indices of columns with at least one non-empty cell (header included). */
function usedColumns(records: RawRecord[], width: number): number[] {
	const used = new Uint8Array(width);
	let remaining = width;
	for (const r of records) {
		for (let j = 0; j < r.cells.length; j++) {
			if (!used[j] && blankToNull(r.cells[j]) !== null) {
				used[j] = 1;
				remaining--;
			}
		}
		if (remaining === 0) break;
	}
	const keep: number[] = [];
	for (let j = 0; j < width; j++) if (used[j]) keep.push(j);
	return keep;
}

function blankToNull(cell: Cell | undefined): Cell {
	if (cell === undefined || cell === null) return null;
	if (typeof cell === 'string') {
		const t = cell.trim();
		return t === '' ? null : t;
	}
	return cell;
}

/** Mostly non-numeric (ties count as a header: a data row is never half text). */
function looksLikeHeader(cells: Cell[]): boolean {
	let filled = 0;
	let text = 0;
	for (const c of cells) {
		if (c === null) continue;
		filled++;
		if (Number.isNaN(parseNumber(c))) text++;
	}
	return text > 0 && text * 2 >= filled;
}

function looksLikeUnitsRow(cells: Cell[]): boolean {
	let filled = 0;
	for (const c of cells) {
		if (c === null) continue;
		if (typeof c !== 'string' || c.length > MAX_UNIT_LENGTH || !Number.isNaN(parseNumber(c))) return false;
		filled++;
	}
	return filled > 0;
}

function applyUnitsRow(columns: ParsedColumn[], units: Cell[], warnings: string[]): void {
	columns.forEach((col, i) => {
		const raw = units[i];
		if (raw === null) return;
		const unit = String(raw).replace(/^\[(.*)\]$|^\((.*)\)$/, '$1$2').trim();
		if (unit === '') return;
		if (col.unit === null) col.unit = unit;
		else if (col.unit !== unit) {
			warnings.push(`column "${col.name}" has unit "${col.unit}" in its header but "${unit}" in the units row; "${col.unit}" was kept`);
		}
	});
}
