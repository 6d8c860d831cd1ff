import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api } from '$lib/server/api';
import { db } from '$lib/server/db';
import { sharedStudy } from '$lib/server/studies/access';
import { runsFilter } from '$lib/server/studies/runsQuery';
import * as studies from '$lib/server/studies/store';

export const GET = api<RequestHandler>(async ({ params, url }) => {
	const study = await sharedStudy(params.token);
	return json({ runs: await studies.runs(db(), study, runsFilter(url, study)) });
});
