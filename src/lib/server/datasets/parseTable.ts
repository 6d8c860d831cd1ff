import { DatasetError } from './datasetError';
import { decodeText } from './decodeText';
import { fileTooLarge, MAX_FILE_BYTES } from './limits';
import { parseDelimited } from './parseDelimited';
import { parseWorkbook } from './parseWorkbook';
import type { ParsedTable } from './types';

export type ParseInput =
	| { bytes: Uint8Array; filename: string; sheet?: string }
	| { text: string; delimiter?: string };

const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04];
const OLE_MAGIC = [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1];

/**
 * An uploaded file (CSV, TSV, XLSX) or pasted text → ParsedTable. Throws
 * DatasetError when the table cannot be read at all; problems with
 * individual cells are left to validateTable.
 */
export async function parseTable(input: ParseInput): Promise<ParsedTable> {
	if ('text' in input) {
		const size = Buffer.byteLength(input.text, 'utf8');
		if (size > MAX_FILE_BYTES) throw fileTooLarge(size);
		return parseDelimited(input.text, { delimiter: input.delimiter || undefined });
	}

	const { bytes, filename, sheet } = input;
	if (bytes.byteLength > MAX_FILE_BYTES) throw fileTooLarge(bytes.byteLength);
	if (bytes.byteLength === 0) throw new DatasetError('empty', 'the file is empty');

	const ext = extensionOf(filename);
	const notes: string[] = [];
	const warnings: string[] = [];
	// Trust the content over the name: a workbook saved as "data.csv" still reads.
	if (startsWith(bytes, ZIP_MAGIC)) {
		if (ext !== 'xlsx' && ext !== 'xlsm') notes.push(`"${filename}" is an XLSX workbook despite its name, and was read as one`);
		return parseWorkbook(bytes, { sheet, notes, warnings });
	}
	if (startsWith(bytes, OLE_MAGIC)) {
		throw new DatasetError(
			'unsupported-format',
			`"${filename}" is a legacy Excel (.xls) workbook, which is not supported; save it as .xlsx or CSV`
		);
	}
	if (ext === 'xlsx' || ext === 'xlsm') {
		throw new DatasetError('unreadable-workbook', `"${filename}" is named like a workbook but is not an XLSX file`);
	}

	const decoded = decodeText(bytes);
	notes.push(...decoded.notes);
	if (sheet !== undefined) warnings.push(`a sheet ("${sheet}") was asked for, but "${filename}" is a text table with no sheets`);
	return parseDelimited(decoded.text, {
		expected: ext === 'tsv' || ext === 'tab' ? '\t' : ',',
		notes,
		warnings
	});
}

function extensionOf(filename: string): string {
	const dot = filename.lastIndexOf('.');
	return dot === -1 ? '' : filename.slice(dot + 1).toLowerCase();
}

function startsWith(bytes: Uint8Array, magic: number[]): boolean {
	return bytes.byteLength >= magic.length && magic.every((b, i) => bytes[i] === b);
}
