import type { RequestHandler } from './$types';
import { api } from '$lib/server/api';
import { db } from '$lib/server/db';
import { formatFrom, studyFitExport } from '$lib/server/studies/fitExports';
import { studyAccess } from '$lib/server/studies/access';

/** `?format=json|python|typescript|csv` → the fit file, generated code or samples, as a download. Viewers may export. */
export const GET = api<RequestHandler>(async (event) => {
	const format = formatFrom(event.url);
	const { study } = await studyAccess(event.locals, event.params.id, 'viewer');
	return studyFitExport(db(), study, event.params.fitId, format);
});
