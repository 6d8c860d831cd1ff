import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api } from '$lib/server/api';
import { db } from '$lib/server/db';
import { studyAccess } from '$lib/server/studies/access';
import { studyJson } from '$lib/server/studies/view';

export const GET = api<RequestHandler>(async ({ locals, params }) => {
	const { study } = await studyAccess(locals, params.id, 'viewer');
	return json(await studyJson(db(), study));
});
