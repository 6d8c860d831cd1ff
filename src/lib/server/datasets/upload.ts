// The upload flow shared by the API route and the upload page's form actions:
// read the request body under the size limit, parse it into a table, check it,
// and store it. Parsing and checking live in ./datasets; storage in ./datasetStore.
import { z } from 'zod';
import { concatBytes } from './limitBytes';
import {
	DatasetError,
	MAX_FILE_BYTES,
	MAX_NAME_LENGTH,
	formatMegabytes,
	sha256,
	validateTable,
	type ErrorDetail,
	type ParsedTable,
	type Role,
	type ValidationReport
} from '.';
import * as datasetStore from './store';
import { controlCharacterIn } from '../../text';
import { clipForMessage } from './limits';
import { previewRows, type PreviewRow } from './previewRows';
import { issueDetails } from './reportErrorBody';
import { fail4xx } from '../api';
import type { ParseInput } from './parseTable';
import { PARSE_HEAP_MB } from './limits';
import { PARSE_BUDGET_MS } from '../offload/limits';
import { OffloadBusy, OffloadOverBudget, runOffThread } from '../offload/pool';
import { ThreadLost } from '../studies/queue/threadPool';
import type { ParseResult } from '../offload/tableWork';

/** Room for the multipart framing and the small fields that travel with the file. */
const FORM_OVERHEAD = 1024 * 1024;
const MAX_UPLOAD_BODY = MAX_FILE_BYTES + FORM_OVERHEAD;
const MAX_DESCRIPTION = 2000;
const HEAD_ROWS = 8;
/** Rows with problems the preview shows beside the first rows. */
const PROBLEM_ROWS = 30;

const ROLE_ERROR = { error: 'a column role must be "input" or "output"' };

/** The fields that travel with an upload (multipart form or the upload page). */
/** The one shape a user may choose: "scatter" takes a grid-like table (a grid with missing cells, say) as scattered points. */
export const SHAPE_CHOICE = z.enum(['scatter'], { error: 'shape may only be "scatter" (take the table as scattered points); leave it out to let the inputs decide' }).optional();

const uploadFieldsSchema = z.object({
	name: z.string().trim().min(1, 'name cannot be empty').max(MAX_NAME_LENGTH, `name can be at most ${MAX_NAME_LENGTH} characters`).optional(),
	description: z.string().trim().max(MAX_DESCRIPTION, `description can be at most ${MAX_DESCRIPTION} characters`).optional(),
	sheet: z.string().trim().min(1).max(100, 'sheet name can be at most 100 characters').optional(),
	roles: z.record(z.string(), z.enum(['input', 'output'], ROLE_ERROR), { error: 'roles must be an object { "column name": "input" | "output" }' }).optional(),
	shape: SHAPE_CHOICE
});
type UploadFields = z.infer<typeof uploadFieldsSchema>;

export type Source =
	| { kind: 'file'; bytes: Uint8Array; filename: string; sheet?: string }
	| { kind: 'paste'; text: string };

function tooLarge(size?: number): DatasetError {
	const what = size === undefined ? `more than ${formatMegabytes(MAX_FILE_BYTES)}` : formatMegabytes(size);
	return new DatasetError('file-too-large', `the upload is ${what}; the file limit is ${formatMegabytes(MAX_FILE_BYTES)}`);
}

/**
 * The request body, read whole but never held past `max` bytes. A declared
 * Content-Length over the limit is refused before reading. A streamed body is
 * kept up to the limit and the rest is read and dropped, up to the server's
 * BODY_SIZE_LIMIT, which ends the stream: cancelling it instead (as limitBytes
 * does) makes the server reset the connection, and the client would never
 * see the 413. Throws the 413 DatasetError.
 */
export async function readBody(request: Request, max = MAX_UPLOAD_BODY): Promise<Uint8Array> {
	const declared = Number(request.headers.get('content-length'));
	if (Number.isFinite(declared) && declared > max) throw tooLarge(declared);
	if (!request.body) return new Uint8Array(0);
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let total = 0;
	let over = false;
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) break;
			total += value.byteLength;
			if (total > max) {
				over = true;
				chunks.length = 0;
				continue;
			}
			// copy: the producer may reuse its chunk buffer
			chunks.push(value.slice());
		}
	} catch (e) {
		// the server's own limit errors the stream with a 413
		if ((e as { status?: number }).status !== 413) throw e;
		over = true;
	} finally {
		reader.releaseLock();
	}
	if (over) throw tooLarge();
	return concatBytes(chunks, total);
}

/** A multipart body under the size limit, as FormData. */
export async function readMultipart(request: Request): Promise<FormData> {
	const type = request.headers.get('content-type') ?? '';
	const bytes = await readBody(request);
	let form: FormData;
	try {
		form = await new Response(bytes as Uint8Array<ArrayBuffer>, { headers: { 'content-type': type } }).formData();
	} catch {
		throw new DatasetError('invalid-body', 'the multipart form body could not be read', [{ field: 'body', problem: 'not a valid multipart/form-data body' }]);
	}
	for (const [key, value] of form) {
		const found = typeof value === 'string' ? controlCharacterIn(key) ?? controlCharacterIn(value) : controlCharacterIn(key);
		if (found) throw new DatasetError('invalid-body', `the form field ${clipForMessage(JSON.stringify(key), 40)} contains a control character (${found}); remove it`, [{ field: key.slice(0, 80), problem: `contains a control character (${found})` }]);
	}
	return form;
}

const text = (form: FormData, key: string): string | undefined => {
	const v = form.get(key);
	return typeof v === 'string' && v.trim() !== '' ? v : undefined;
};

/**
 * The fields of an upload form. Roles come as JSON in `roles` (scripts) or as
 * one `role:<column>` field per column (the upload page's selects).
 */
export function uploadFields(form: FormData): UploadFields {
	let roles: unknown;
	const rolesJson = text(form, 'roles');
	if (rolesJson !== undefined) {
		try {
			roles = JSON.parse(rolesJson);
		} catch {
			throw new DatasetError('invalid-body', 'roles is not valid JSON; send an object like {"J": "input", "eta": "output"}', [
				{ field: 'roles', problem: 'not valid JSON' }
			]);
		}
	} else {
		const picked: Record<string, string> = {};
		for (const [key, value] of form) if (key.startsWith('role:') && typeof value === 'string') picked[key.slice(5)] = value;
		if (Object.keys(picked).length) roles = picked;
	}
	const parsed = uploadFieldsSchema.safeParse({
		name: text(form, 'name'),
		description: text(form, 'description'),
		sheet: text(form, 'sheet'),
		roles,
		shape: text(form, 'shape')
	});
	if (!parsed.success) {
		const details: ErrorDetail[] = parsed.error.issues.map((i) => ({ field: i.path.map(String).join('.') || 'body', problem: i.message }));
		throw new DatasetError('invalid-body', `${details[0].field}: ${details[0].problem}`, details);
	}
	return parsed.data;
}

/** The file (or pasted cells) of an upload form; null when neither was sent. */
export async function uploadSource(form: FormData, sheet?: string): Promise<Source | null> {
	const file = form.get('file');
	if (file instanceof File && (file.size > 0 || file.name !== '')) {
		if (file.size > MAX_FILE_BYTES) throw tooLarge(file.size);
		return { kind: 'file', bytes: new Uint8Array(await file.arrayBuffer()), filename: file.name || 'upload', sheet };
	}
	const pasted = form.get('text');
	if (typeof pasted === 'string' && pasted.trim() !== '') return { kind: 'paste', text: pasted };
	return null;
}

/** Read the table on an offload thread (never on the request thread), within a time and memory budget. */
export async function parseSource(source: Source): Promise<ParsedTable> {
	const input: ParseInput =
		source.kind === 'file' ? { bytes: source.bytes, filename: source.filename, ...(source.sheet ? { sheet: source.sheet } : {}) } : { text: source.text };
	let result: ParseResult;
	try {
		result = await runOffThread<ParseResult>({ kind: 'parse', input }, PARSE_BUDGET_MS);
	} catch (e) {
		if (e instanceof OffloadOverBudget) throw new DatasetError('over-budget', `reading the file ${e.message} (the limit for one upload); save it as CSV, or split it`);
		if (e instanceof OffloadBusy) fail4xx(503, e.message, 'busy');
		if (e instanceof ThreadLost && e.kind === 'died') {
			throw new DatasetError('expands-too-far', `reading the file needed more than the ${PARSE_HEAP_MB} MB one upload may use; save the sheet as CSV, or split it`);
		}
		throw e;
	}
	if (!result.ok) throw new DatasetError(result.code, result.message, result.details);
	return result.table;
}

export function sourceBytes(source: Source): Uint8Array {
	return source.kind === 'file' ? source.bytes : new TextEncoder().encode(source.text);
}

/** "prop-sweep_v2.csv" → "prop-sweep_v2". */
export function defaultName(source: Source): string {
	if (source.kind === 'paste') return 'pasted table';
	const stem = source.filename.replace(/\.[A-Za-z0-9]{1,5}$/, '').trim();
	return (stem || 'upload').slice(0, MAX_NAME_LENGTH);
}

/** The report of a checked table, as the upload page and `?dryRun=1` show it. */
interface UploadReport {
	ok: boolean;
	name: string;
	/** the version saving would create */
	version: number;
	format: ParsedTable['format'];
	filename: string | null;
	sheet: string | null;
	sheets: string[];
	hasHeader: boolean;
	shape: ValidationReport['shape'];
	shapeReason: string;
	columns: ValidationReport['columns'];
	inputs: string[];
	outputs: string[];
	rowCount: number;
	/** table-wide problems, then row by row; bounded, the last one saying how many more */
	errors: ErrorDetail[];
	/** every problem found, listed or not */
	problemCount: number;
	/** rows with the wrong number of fields, left out of rowCount */
	leftOutCount: number;
	warnings: string[];
	notes: string[];
	/** the first rows as read and the rows with problems, in row order, bad cells marked */
	head: PreviewRow[];
}

export function uploadReport(parsed: ParsedTable, report: ValidationReport, name: string, version: number, filename: string | null): UploadReport {
	return {
		ok: report.ok,
		name,
		version,
		format: parsed.format,
		filename,
		sheet: parsed.sheet ?? null,
		sheets: parsed.sheets ?? [],
		hasHeader: parsed.hasHeader,
		shape: report.shape,
		shapeReason: report.shapeReason,
		columns: report.columns,
		inputs: report.columns.filter((c) => c.role === 'input').map((c) => c.name),
		outputs: report.columns.filter((c) => c.role === 'output').map((c) => c.name),
		rowCount: report.rowCount,
		errors: issueDetails(report.errors),
		problemCount: report.problemCount,
		leftOutCount: parsed.badRowCount ?? 0,
		warnings: report.warnings,
		notes: report.notes,
		head: previewRows(parsed, report.errors, { head: HEAD_ROWS, problemRows: PROBLEM_ROWS })
	};
}

/** Roles limited to the table's columns (the page keeps selects from an earlier file). */
export function rolesFor(parsed: ParsedTable, roles: Record<string, Role> | undefined): Record<string, Role> | undefined {
	if (!roles) return undefined;
	const names = new Set(parsed.columns.map((c) => c.name));
	const kept = Object.fromEntries(Object.entries(roles).filter(([k]) => names.has(k)));
	return Object.keys(kept).length ? kept : undefined;
}

interface SaveInput {
	workspaceId: string;
	userId: string;
	name: string;
	description?: string;
	parsed: ParsedTable;
	report: ValidationReport;
	filename: string | null;
	bytes: Uint8Array;
	/** removed in the same transaction as the dataset is written */
	draftId?: string;
}

/**
 * Store a checked table as the next version of its name. The dataset row and
 * the removal of its draft commit together or not at all.
 */
export async function save(db: import('knex').Knex, input: SaveInput): Promise<datasetStore.DatasetMeta> {
	const { report, parsed } = input;
	if (!report.ok || !report.data || !report.shape) throw new Error('save() needs a table that passed validateTable');
	const data = report.data;
	const shape = report.shape;
	return db.transaction(async (trx) => {
		const meta = await datasetStore.create(trx, {
			workspaceId: input.workspaceId,
			name: input.name,
			description: input.description ?? '',
			shape,
			shapeReason: report.shapeReason,
			columns: report.columns,
			data,
			rowCount: report.rowCount,
			sourceFormat: parsed.format,
			sourceFilename: input.filename,
			sourceBytes: input.bytes,
			sourceSha256: sha256(input.bytes),
			notes: report.notes,
			warnings: report.warnings,
			createdBy: input.userId
		});
		if (input.draftId) await trx('dataset_drafts').where({ id: input.draftId }).delete();
		return meta;
	});
}

/** Runs the checks: validateTable with the caller's roles. */
export function check(parsed: ParsedTable, roles?: Record<string, Role>, options: { shape?: 'scatter' } = {}): ValidationReport {
	return validateTable(parsed, roles, options);
}
