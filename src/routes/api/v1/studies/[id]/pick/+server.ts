import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, readJson } from '$lib/server/api';
import { db } from '$lib/server/db';
import { studyAccess } from '$lib/server/studies/access';
import { pickFit } from '$lib/server/studies/commands';
import { pickSchema } from '$lib/server/studies/launchRequest';

/** `{ fitId, rationale }` → 200 with the pick `{ fitId, rationale, by, at }` */
export const POST = api<RequestHandler>(async (event) => {
	const { study, access } = await studyAccess(event.locals, event.params.id, 'editor');
	const input = await readJson(event, pickSchema);
	return json({ pick: await pickFit(db(), study, access.user.id, input) });
});
