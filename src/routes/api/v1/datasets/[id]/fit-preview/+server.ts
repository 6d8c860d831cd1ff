import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx, readJson } from '$lib/server/api';
import { db } from '$lib/server/db';
import { datasetAccess } from '$lib/server/datasets/access';
import * as datasetStore from '$lib/server/datasets/store';
import { fitPreview, fitPreviewSchema } from '$lib/server/datasets/fitPreview';

/** `{ output, method, options?, at? }` → samples of f, f′, f″, the smoothness audit and fidelity. Viewers may preview. */
export const POST = api<RequestHandler>(async (event) => {
	const { dataset } = await datasetAccess(event.locals, event.params.id, 'viewer');
	const body = await readJson(event, fitPreviewSchema);
	const full = await datasetStore.getWithData(db(), dataset.id);
	if (!full) fail4xx(404, 'no such dataset');
	return json(await fitPreview(full, body));
});
