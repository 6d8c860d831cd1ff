import { json } from '@sveltejs/kit';
import { z } from 'zod';
import type { RequestHandler } from './$types';
import { api, readJson } from '$lib/server/api';
import { db } from '$lib/server/db';
import { datasetAccess } from '$lib/server/datasets/access';
import * as datasetStore from '$lib/server/datasets/store';

const archiveSchema = z.object({ archived: z.boolean({ error: 'archived must be true or false' }).default(true) }).strict();

/** Hide a dataset from lists (`{ archived: false }` brings it back); studies keep using it. */
export const POST = api<RequestHandler>(async (event) => {
	const { dataset } = await datasetAccess(event.locals, event.params.id, 'editor');
	const hasBody = Number(event.request.headers.get('content-length') ?? 0) > 0;
	const { archived } = hasBody ? await readJson(event, archiveSchema) : { archived: true };
	const archivedAt = await datasetStore.setArchived(db(), dataset.id, archived);
	return json({ id: dataset.id, archived, archivedAt });
});
