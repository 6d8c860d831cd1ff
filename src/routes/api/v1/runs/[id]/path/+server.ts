import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import { studyAccess } from '$lib/server/studies/access';
import * as studies from '$lib/server/studies/store';

/** The whole path of one run: `{ x, f, grad, step, violation }`. */
export const GET = api<RequestHandler>(async ({ locals, params }) => {
	const run = await studies.runPath(db(), params.id);
	if (!run) fail4xx(404, 'no such run');
	await studyAccess(locals, run.studyId, 'viewer');
	return json(run.path);
});
