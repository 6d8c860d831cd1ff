import type { RequestHandler } from './$types';
import { api, fail4xx } from '$lib/server/api';
import { requireUser } from '$lib/server/workspaces/access';
import * as apiTokens from '$lib/server/accounts/apiTokens';
import { db } from '$lib/server/db';

export const DELETE = api<RequestHandler>(async ({ locals, params }) => {
	const user = requireUser(locals);
	if (!(await apiTokens.revoke(db(), user.id, params.id))) fail4xx(404, 'no such token');
	return new Response(null, { status: 204 });
});
