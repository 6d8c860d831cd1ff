import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api } from '$lib/server/api';
import { db } from '$lib/server/db';
import { studyAccess } from '$lib/server/studies/access';
import { runsFilter } from '$lib/server/studies/runsQuery';
import * as studies from '$lib/server/studies/store';

/** Every run (paths excluded); optional ?fitId=&optimizer=&limit=&offset= */
export const GET = api<RequestHandler>(async ({ locals, params, url }) => {
	const { study } = await studyAccess(locals, params.id, 'viewer');
	return json({ runs: await studies.runs(db(), study, runsFilter(url, study)) });
});
