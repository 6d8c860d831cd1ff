import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import { datasetAccess, datasetJson, rowsJson } from '$lib/server/datasets/access';
import * as datasetStore from '$lib/server/datasets/store';

/** Metadata, columns, shape and row count; `?rows=1` adds the rows (row-major, in column order). */
export const GET = api<RequestHandler>(async ({ locals, params, url }) => {
	const { dataset } = await datasetAccess(locals, params.id, 'viewer');
	if (url.searchParams.get('rows') !== '1') return json(datasetJson(dataset));
	const full = await datasetStore.getWithData(db(), dataset.id);
	if (!full) fail4xx(404, 'no such dataset');
	const head = JSON.stringify(datasetJson(dataset));
	return new Response(`${head.slice(0, -1)},"rows":${rowsJson(full.data, full.rowCount)}}`, { headers: { 'content-type': 'application/json' } });
});

/** Editors delete a dataset no study uses; one in use can only be archived. */
export const DELETE = api<RequestHandler>(async ({ locals, params }) => {
	const { dataset } = await datasetAccess(locals, params.id, 'editor');
	const result = await datasetStore.remove(db(), dataset.id);
	if (result === 'in-use') {
		fail4xx(409, `dataset "${dataset.name}" version ${dataset.version} is used by a study; archive it instead`, 'dataset-in-use');
	}
	if (result === 'missing') fail4xx(404, 'no such dataset');
	return new Response(null, { status: 204 });
});
