// A dataset found by id, through the role check of its workspace.
import type { Role } from '../../schemas';
import { requireUser, workspaceAccessById, type Access } from '../workspaces/access';
import { fail4xx } from '../api';
import { db } from '../db';
import * as datasetStore from './store';

/**
 * The dataset's metadata and the caller's access; 404 for unknown ids and for outsiders
 * alike. A caller who is not signed in gets 401 before any lookup, whatever the id, so
 * the answer never tells an existing id from a made-up one.
 */
export async function datasetAccess(locals: App.Locals, id: string, need: Role = 'viewer'): Promise<{ access: Access; dataset: datasetStore.DatasetMeta }> {
	requireUser(locals);
	const dataset = await datasetStore.get(db(), id);
	if (!dataset) fail4xx(404, 'no such dataset');
	try {
		return { access: await workspaceAccessById(locals, dataset.workspaceId, need), dataset };
	} catch (e) {
		// an outsider learns nothing about the id, not even the workspace's name
		if ((e as { status?: number }).status === 404) fail4xx(404, 'no such dataset');
		throw e;
	}
}

/** The JSON form of a dataset's metadata (API and page alike). */
export function datasetJson(d: datasetStore.DatasetMeta) {
	return {
		id: d.id,
		name: d.name,
		version: d.version,
		shape: d.shape,
		shapeReason: d.shapeReason,
		description: d.description,
		columns: d.columns,
		inputs: d.columns.filter((c) => c.role === 'input').map((c) => c.name),
		outputs: d.columns.filter((c) => c.role === 'output').map((c) => c.name),
		rowCount: d.rowCount,
		source: { format: d.sourceFormat, filename: d.sourceFilename, sha256: d.sourceSha256 },
		notes: d.notes,
		warnings: d.warnings,
		createdAt: d.createdAt,
		archivedAt: d.archivedAt
	};
}

/**
 * Column-major arrays → the JSON text of row-major rows, `[[x, y], …]`, built
 * directly: stored values are always finite, and String(v) writes a number
 * exactly as JSON.stringify does, without a hundred thousand little arrays.
 */
export function rowsJson(data: Float64Array[], rowCount: number): string {
	const parts: string[] = new Array(rowCount);
	const k = data.length;
	for (let i = 0; i < rowCount; i++) {
		let row = '[' + String(data[0][i]);
		for (let j = 1; j < k; j++) row += ',' + String(data[j][i]);
		parts[i] = row + ']';
	}
	return '[' + parts.join(',') + ']';
}
