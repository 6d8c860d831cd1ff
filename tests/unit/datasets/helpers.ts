import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import { expect } from 'vitest';
import { DatasetError } from '../../../src/lib/server/datasets/datasetError';
import { parseTable } from '../../../src/lib/server/datasets/parseTable';
import type { ParsedTable } from '../../../src/lib/server/datasets/types';

export const bytesOf = (text: string): Uint8Array => new TextEncoder().encode(text);

/** Parses `text` as the bytes of an uploaded file called `filename`. */
export function parseFile(text: string, filename = 'table.csv'): Promise<ParsedTable> {
	return parseTable({ bytes: bytesOf(text), filename });
}

/** Awaits a rejection and checks it is a DatasetError with `code` whose message holds every fragment. */
export async function expectDatasetError(work: Promise<unknown> | (() => unknown), code: string, ...fragments: string[]): Promise<DatasetError> {
	let caught: unknown;
	try {
		await (typeof work === 'function' ? work() : work);
	} catch (e) {
		caught = e;
	}
	expect(caught, 'expected a DatasetError').toBeInstanceOf(DatasetError);
	const error = caught as DatasetError;
	expect(error.code, error.message).toBe(code);
	for (const fragment of fragments) expect(error.message).toContain(fragment);
	return error;
}

/** An XLSX file built in memory with exceljs. */
export async function workbookBytes(build: (wb: ExcelJS.Workbook) => void): Promise<Uint8Array> {
	const wb = new ExcelJS.Workbook();
	build(wb);
	return new Uint8Array(await wb.xlsx.writeBuffer());
}

/** Deterministic bytes for "binary" files (a 32-bit LCG; the seed fixes the content). */
export function pseudoRandomBytes(n: number, seed: number, map: (b: number) => number = (b) => b): Uint8Array {
	const out = new Uint8Array(n);
	let s = seed >>> 0;
	for (let i = 0; i < n; i++) {
		s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
		out[i] = map(s >>> 24);
	}
	return out;
}

/**
 * A one-sheet workbook whose sheet XML is written by hand: a header row x, y and
 * `rows` numeric rows (with cell addresses unless `addressed` is false), with extra
 * cells from `extra`. `lie` rewrites every size its ZIP directory declares to 1 KB.
 */
export async function handWrittenSheet(rows: number, { addressed = true, lie = false, extra = '' } = {}): Promise<Uint8Array> {
	const zip = await JSZip.loadAsync(await workbookBytes((wb) => wb.addWorksheet('Sweep').addRow(['x', 'y'])));
	const body: string[] = ['<?xml version="1.0" encoding="UTF-8" standalone="yes"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>'];
	body.push('<row r="1"><c r="A1" t="inlineStr"><is><t>x</t></is></c><c r="B1" t="inlineStr"><is><t>y</t></is></c></row>');
	// rows without addresses are identical (OOXML allows that): they compress about 1,000 to 1
	if (addressed) for (let i = 2; i <= rows + 1; i++) body.push(`<row r="${i}"><c r="A${i}"><v>${i}</v></c><c r="B${i}"><v>2.5</v></c></row>`);
	else body.push('<row><c><v>1.5</v></c><c><v>2.5</v></c></row>'.repeat(rows));
	body.push(extra, '</sheetData></worksheet>');
	zip.file('xl/worksheets/sheet1.xml', body.join(''));
	const bytes = await zip.generateAsync({ type: 'uint8array', compression: 'DEFLATE', compressionOptions: { level: 9 } });
	if (lie) {
		const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
		for (let i = 0; i + 46 < bytes.byteLength; i++) if (view.getUint32(i, true) === 0x02014b50) view.setUint32(i + 24, 1024, true);
	}
	return bytes;
}
