/**
 * Reading an uploaded table (CSV, TSV, XLSX) on an offload thread, answered as
 * plain data: the parsed table, or the DatasetError's parts. The thread's heap
 * is capped (PARSE_HEAP_MB), so a workbook that lies about its expanded size
 * kills that thread, not the server.
 */
import { DatasetError, type DatasetErrorCode } from '../datasets/datasetError';
import { parseTable, type ParseInput } from '../datasets/parseTable';
import type { ErrorDetail, ParsedTable } from '../datasets/types';

export type ParseTask = { kind: 'parse'; input: ParseInput };
export type ParseResult = { ok: true; table: ParsedTable } | { ok: false; code: DatasetErrorCode; message: string; details: ErrorDetail[] };

export async function parseTableTask(task: ParseTask): Promise<ParseResult> {
	try {
		return { ok: true, table: await parseTable(task.input) };
	} catch (e) {
		if (e instanceof DatasetError) return { ok: false, code: e.code, message: e.message, details: e.details };
		throw e;
	}
}
