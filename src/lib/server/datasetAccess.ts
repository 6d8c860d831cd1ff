// A dataset found by id, through the role check of its workspace.
import type { Role } from '$lib/schemas';
import { workspaceAccessById, type Access } from './access';
import { fail4xx } from './api';
import { db } from './db';
import * as datasetStore from './datasetStore';

/** The dataset's metadata and the caller's access; 404 for unknown ids and for outsiders alike. */
export async function datasetAccess(locals: App.Locals, id: string, need: Role = 'viewer'): Promise<{ access: Access; dataset: datasetStore.DatasetMeta }> {
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

/** Column-major arrays → row-major rows (the shape the JSON upload takes). */
export function rowsOf(data: Float64Array[], rowCount: number): number[][] {
	const rows: number[][] = new Array(rowCount);
	const k = data.length;
	for (let i = 0; i < rowCount; i++) {
		const r = new Array<number>(k);
		for (let j = 0; j < k; j++) r[j] = data[j][i];
		rows[i] = r;
	}
	return rows;
}
