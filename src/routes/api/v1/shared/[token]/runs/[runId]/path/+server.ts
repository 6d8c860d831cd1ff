import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import { sharedStudy } from '$lib/server/studies/access';
import * as studies from '$lib/server/studies/store';

export const GET = api<RequestHandler>(async ({ params }) => {
	const study = await sharedStudy(params.token);
	const run = await studies.runPath(db(), params.runId);
	if (!run || run.studyId !== study.id) fail4xx(404, 'no such run');
	return json(run.path);
});
