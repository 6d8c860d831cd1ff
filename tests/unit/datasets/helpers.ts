import ExcelJS from 'exceljs';
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
