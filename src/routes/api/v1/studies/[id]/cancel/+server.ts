import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api } from '$lib/server/api';
import { db } from '$lib/server/db';
import { studyAccess } from '$lib/server/studies/access';
import { cancelStudy } from '$lib/server/studies/commands';

/** Stop a queued or running study; runs already stored stay. 200 `{ id, status: "cancelled" }`, 409 when it has already ended. */
export const POST = api<RequestHandler>(async ({ locals, params }) => {
	const { study, access } = await studyAccess(locals, params.id, 'editor');
	await cancelStudy(db(), study, access.user.id);
	return json({ id: study.id, status: 'cancelled' });
});
