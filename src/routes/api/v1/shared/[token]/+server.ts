import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api } from '$lib/server/api';
import { db } from '$lib/server/db';
import { sharedStudy } from '$lib/server/studies/access';
import { studyJson } from '$lib/server/studies/view';

/** The study behind a share link, read-only, no sign-in. */
export const GET = api<RequestHandler>(async ({ params, setHeaders }) => {
	const study = await sharedStudy(params.token);
	setHeaders({ 'referrer-policy': 'no-referrer' });
	return json(await studyJson(db(), study));
});
