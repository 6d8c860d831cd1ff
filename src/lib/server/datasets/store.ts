// Datasets in PostgreSQL: metadata + column-major float64 data in one row.
import { isUuid } from '../../text';
import type { Db } from '../db';
import type { Role, Shape } from './types';

type DatasetColumn = { name: string; unit: string | null; role: Role };
export type DatasetMeta = {
	id: string;
	workspaceId: string;
	name: string;
	version: number;
	shape: Shape;
	shapeReason: string;
	description: string;
	columns: DatasetColumn[];
	rowCount: number;
	sourceFormat: string;
	sourceFilename: string | null;
	sourceSha256: string;
	notes: string[];
	warnings: string[];
	createdBy: string | null;
	createdAt: Date;
	archivedAt: Date | null;
};

const META_COLUMNS = [
	'id', 'workspace_id', 'name', 'version', 'shape', 'shape_reason', 'description', 'columns', 'row_count',
	'source_format', 'source_filename', 'source_sha256', 'notes', 'warnings', 'created_by', 'created_at', 'archived_at'
];

// eslint-disable-next-line @typescript-eslint/no-explicit-any
function toMeta(r: any): DatasetMeta {
	return {
		id: r.id,
		workspaceId: r.workspace_id,
		name: r.name,
		version: r.version,
		shape: r.shape,
		shapeReason: r.shape_reason,
		description: r.description,
		columns: r.columns,
		rowCount: r.row_count,
		sourceFormat: r.source_format,
		sourceFilename: r.source_filename,
		sourceSha256: r.source_sha256,
		notes: r.notes,
		warnings: r.warnings,
		createdBy: r.created_by,
		createdAt: r.created_at,
		archivedAt: r.archived_at
	};
}

/** Pack columns (each rowCount long) column-major into little-endian float64 bytes. */
function packColumns(columns: ArrayLike<number>[], rowCount: number): Buffer {
	const out = new Float64Array(columns.length * rowCount);
	columns.forEach((c, i) => out.set(c instanceof Float64Array ? c : Array.from(c), i * rowCount));
	// Float64Array is platform-endian; every platform Node supports here is little-endian.
	return Buffer.from(out.buffer, out.byteOffset, out.byteLength);
}

function unpackColumns(bytes: Buffer, columnCount: number, rowCount: number): Float64Array[] {
	const copy = new Float64Array(columnCount * rowCount);
	new Uint8Array(copy.buffer).set(bytes);
	return Array.from({ length: columnCount }, (_, i) => copy.subarray(i * rowCount, (i + 1) * rowCount));
}

type NewDataset = {
	workspaceId: string;
	name: string;
	description?: string;
	shape: Shape;
	shapeReason: string;
	columns: DatasetColumn[];
	data: ArrayLike<number>[];
	rowCount: number;
	sourceFormat: string;
	sourceFilename: string | null;
	sourceBytes: Uint8Array | null;
	sourceSha256: string;
	notes: string[];
	warnings: string[];
	createdBy: string | null;
};

/**
 * Store a dataset as the next version of its name, in one statement: the row is
 * written whole or not at all. The version is chosen under a per-name advisory
 * lock so two simultaneous uploads of the same name get distinct versions.
 */
export async function create(db: Db, d: NewDataset): Promise<DatasetMeta> {
	const run = async (trx: Db) => {
		await trx.raw('SELECT pg_advisory_xact_lock(hashtext(?))', [`${d.workspaceId}/${d.name}`]);
		const prev = await trx('datasets').where({ workspace_id: d.workspaceId, name: d.name }).max<{ v: number | null }>('version as v').first();
		const [row] = await trx('datasets')
			.insert({
				workspace_id: d.workspaceId,
				name: d.name,
				version: (prev?.v ?? 0) + 1,
				shape: d.shape,
				shape_reason: d.shapeReason,
				description: d.description ?? '',
				columns: JSON.stringify(d.columns),
				row_count: d.rowCount,
				data: packColumns(d.data, d.rowCount),
				source_format: d.sourceFormat,
				source_filename: d.sourceFilename,
				source_bytes: d.sourceBytes ? Buffer.from(d.sourceBytes) : null,
				source_sha256: d.sourceSha256,
				notes: JSON.stringify(d.notes),
				warnings: JSON.stringify(d.warnings),
				created_by: d.createdBy
			})
			.returning(META_COLUMNS);
		return toMeta(row);
	};
	return 'isTransaction' in db && db.isTransaction ? run(db) : (db as import('knex').Knex).transaction(run);
}

export async function get(db: Db, id: string): Promise<DatasetMeta | null> {
	if (!isUuid(id)) return null;
	const row = await db('datasets').where({ id }).first(META_COLUMNS);
	return row ? toMeta(row) : null;
}

/** Metadata plus the numbers, one Float64Array per column in column order. */
/**
 * The stored numbers are read in pieces of this many bytes. The driver decodes a
 * bytea value on the request thread (hex text to bytes); a 150,000-row table in one
 * piece held that thread for 35 ms (over 150 ms on a loaded machine), so big tables
 * come in pieces with the event loop free between them.
 */
const DATA_PIECE_BYTES = 256 * 1024;

export async function getWithData(db: Db, id: string): Promise<(DatasetMeta & { data: Float64Array[] }) | null> {
	if (!isUuid(id)) return null;
	// the first piece comes with the metadata, so a small table is still one query
	const row = await db('datasets')
		.where({ id })
		.first([...META_COLUMNS, db.raw('octet_length(data)::int as data_bytes'), db.raw('substring(data from 1 for ?) as piece', [DATA_PIECE_BYTES])]);
	if (!row) return null;
	const meta = toMeta(row);
	const total: number = row.data_bytes;
	if (total <= DATA_PIECE_BYTES) return { ...meta, data: unpackColumns(row.piece, meta.columns.length, meta.rowCount) };
	const bytes = Buffer.alloc(total);
	(row.piece as Buffer).copy(bytes, 0);
	// a dataset's numbers never change once stored (a change is a new version), so pieces read apart fit together
	for (let at = DATA_PIECE_BYTES; at < total; at += DATA_PIECE_BYTES) {
		const piece = await db('datasets').where({ id }).first(db.raw('substring(data from ? for ?) as piece', [at + 1, DATA_PIECE_BYTES]));
		(piece.piece as Buffer).copy(bytes, at);
	}
	return { ...meta, data: unpackColumns(bytes, meta.columns.length, meta.rowCount) };
}

export async function listForWorkspace(db: Db, workspaceId: string, includeArchived = false): Promise<DatasetMeta[]> {
	const q = db('datasets').where({ workspace_id: workspaceId }).orderBy('created_at', 'desc').select(META_COLUMNS);
	if (!includeArchived) q.whereNull('archived_at');
	return (await q).map(toMeta);
}

/** Every version of one dataset name in a workspace, newest first (archived ones included). */
export async function versions(db: Db, workspaceId: string, name: string): Promise<{ id: string; version: number; createdAt: Date; archivedAt: Date | null }[]> {
	const rows = await db('datasets')
		.where({ workspace_id: workspaceId, name })
		.orderBy('version', 'desc')
		.select('id', 'version', 'created_at', 'archived_at');
	return rows.map((r) => ({ id: r.id, version: r.version, createdAt: r.created_at, archivedAt: r.archived_at }));
}

/** The highest version stored under `name`, or 0 when the name is new. */
export async function latestVersion(db: Db, workspaceId: string, name: string): Promise<number> {
	const row = await db('datasets').where({ workspace_id: workspaceId, name }).max<{ v: number | null }>('version as v').first();
	return row?.v ?? 0;
}

/** Hide a dataset from lists (or show it again); studies that use it keep working. */
export async function setArchived(db: Db, id: string, archived: boolean): Promise<Date | null> {
	const [row] = await db('datasets')
		.where({ id })
		.update({ archived_at: archived ? db.raw('COALESCE(archived_at, now())') : null })
		.returning('archived_at');
	return row?.archived_at ?? null;
}

/**
 * How many studies use the dataset. The studies table belongs to another
 * module and may not exist yet (or not have the column), hence the catalogue check.
 */
export async function studyCount(db: Db, id: string): Promise<number> {
	const has = await db.raw(
		`SELECT 1 FROM information_schema.columns WHERE table_schema = current_schema() AND table_name = 'studies' AND column_name = 'dataset_id'`
	);
	if (has.rows.length === 0) return 0;
	const row = await db('studies').where({ dataset_id: id }).count<{ n: number }[]>('* as n').first();
	return Number(row?.n ?? 0);
}

/**
 * Delete a dataset unless a study uses it. The count and the delete share a
 * transaction; a study inserted in between still trips the foreign key
 * (23503), which is reported the same way.
 */
export async function remove(db: Db, id: string): Promise<'deleted' | 'in-use' | 'missing'> {
	const run = async (trx: Db): Promise<'deleted' | 'in-use' | 'missing'> => {
		if ((await studyCount(trx, id)) > 0) return 'in-use';
		try {
			const n = await trx('datasets').where({ id }).delete();
			return n > 0 ? 'deleted' : 'missing';
		} catch (e) {
			if ((e as { code?: string }).code === '23503') return 'in-use';
			throw e;
		}
	};
	return 'isTransaction' in db && db.isTransaction ? run(db) : (db as import('knex').Knex).transaction(run);
}
