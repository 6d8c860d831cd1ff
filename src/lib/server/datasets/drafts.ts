// Checked-but-unsaved uploads (see migrations/*_dataset_drafts.ts).
import { isUuid } from '../../text';
import type { Db } from '../db';

type Draft = { id: string; kind: 'file' | 'paste'; filename: string | null; bytes: Uint8Array; createdAt: Date };

const KEEP_HOURS = 24;

export async function create(
	db: Db,
	d: { workspaceId: string; userId: string; kind: Draft['kind']; filename: string | null; bytes: Uint8Array }
): Promise<string> {
	await db('dataset_drafts').where('created_at', '<', db.raw(`now() - interval '${KEEP_HOURS} hours'`)).delete();
	const [row] = await db('dataset_drafts')
		.insert({ workspace_id: d.workspaceId, created_by: d.userId, kind: d.kind, filename: d.filename, bytes: Buffer.from(d.bytes.buffer, d.bytes.byteOffset, d.bytes.byteLength) })
		.returning('id');
	return row.id;
}

/** A draft of this user in this workspace, or null (unknown, someone else's, or expired). */
export async function get(db: Db, id: string, workspaceId: string, userId: string): Promise<Draft | null> {
	if (!isUuid(id)) return null;
	const row = await db('dataset_drafts')
		.where({ id, workspace_id: workspaceId, created_by: userId })
		.andWhere('created_at', '>=', db.raw(`now() - interval '${KEEP_HOURS} hours'`))
		.first('id', 'kind', 'filename', 'bytes', 'created_at');
	if (!row) return null;
	return { id: row.id, kind: row.kind, filename: row.filename, bytes: new Uint8Array(row.bytes), createdAt: row.created_at };
}

export async function remove(db: Db, id: string): Promise<void> {
	await db('dataset_drafts').where({ id }).delete();
}
