import type { RequestHandler } from './$types';
import { api } from '$lib/server/api';
import { db } from '$lib/server/db';
import { sharedStudy } from '$lib/server/studies/access';
import { studyRecordResponse } from '$lib/server/studies/record';

/** The study record behind a share link, read-only (HTML, or `?format=pdf`). */
export const GET = api<RequestHandler>(async ({ params, url, setHeaders }) => {
	const study = await sharedStudy(params.token);
	setHeaders({ 'referrer-policy': 'no-referrer' });
	return studyRecordResponse(db(), study, url, { note: 'Opened through a read-only share link.' });
});
