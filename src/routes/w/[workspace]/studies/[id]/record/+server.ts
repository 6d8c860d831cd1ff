import { redirect } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import { studyAccess } from '$lib/server/studies/access';
import { studyRecordResponse } from '$lib/server/studies/record';

const record = api<RequestHandler>(async ({ locals, params, url }) => {
	const { study, access } = await studyAccess(locals, params.id, 'viewer');
	if (access.workspace.slug !== params.workspace) fail4xx(404, 'no such study');
	return studyRecordResponse(db(), study, url);
});

/** The printable study record (HTML), or `?format=pdf` printed by headless Chromium. Viewers may read it; signed-out visitors go to the sign-in page. */
export const GET: RequestHandler = async (event) => {
	if (!event.locals.user) redirect(303, `/login?next=${encodeURIComponent(event.url.pathname)}`);
	return record(event);
};
