import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx, readJson } from '$lib/server/api';
import { db } from '$lib/server/db';
import { datasetAccess } from '$lib/server/datasets/access';
import * as datasetStore from '$lib/server/datasets/store';
import { fitPreview, fitPreviewSchema } from '$lib/server/datasets/fitPreview';
import { surfacePreview, surfacePreviewSchema } from '$lib/server/datasets/surfacePreview';

/**
 * Curves: `{ output, method, options?, at? }` → samples of f, f′, f″, the smoothness audit and fidelity.
 * Grids and scattered data: `{ output, method, options?, through?, map?, resolution? }` → a map over two
 * inputs, slices through a point along each input, the audit per input and leave-one-out fidelity.
 * Viewers may preview.
 */
export const POST = api<RequestHandler>(async (event) => {
	const { dataset } = await datasetAccess(event.locals, event.params.id, 'viewer');
	if (dataset.shape !== 'curve') {
		const body = await readJson(event, surfacePreviewSchema);
		const full = await datasetStore.getWithData(db(), dataset.id);
		if (!full) fail4xx(404, 'no such dataset');
		return json(await surfacePreview(full, body));
	}
	const body = await readJson(event, fitPreviewSchema);
	const full = await datasetStore.getWithData(db(), dataset.id);
	if (!full) fail4xx(404, 'no such dataset');
	return json(await fitPreview(full, body));
});
