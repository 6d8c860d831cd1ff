import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import { requireUser } from '$lib/server/workspaces/access';
import { studyAccess } from '$lib/server/studies/access';
import * as studies from '$lib/server/studies/store';

/** The whole path of one run: `{ x, f, grad, step, violation }`. */
export const GET = api<RequestHandler>(async ({ locals, params }) => {
	// signed out: 401 before the lookup, so existing and made-up ids answer alike
	requireUser(locals);
	const run = await studies.runPath(db(), params.id);
	if (!run) fail4xx(404, 'no such run');
	try {
		await studyAccess(locals, run.studyId, 'viewer');
	} catch (e) {
		if ((e as { status?: number }).status === 404) fail4xx(404, 'no such run');
		throw e;
	}
	return json(run.path);
});
