import type { RequestHandler } from './$types';
import { api } from '$lib/server/api';
import { db } from '$lib/server/db';
import { formatFrom, studyFitExport } from '$lib/server/studies/fitExports';
import { sharedStudy } from '$lib/server/studies/access';

/** A fit of the study behind a share link, exported read-only, no sign-in. */
export const GET = api<RequestHandler>(async ({ params, url, setHeaders }) => {
	const format = formatFrom(url);
	const study = await sharedStudy(params.token);
	setHeaders({ 'referrer-policy': 'no-referrer' });
	return studyFitExport(db(), study, params.fitId, format);
});
