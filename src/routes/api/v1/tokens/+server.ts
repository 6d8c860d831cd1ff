import { json } from '@sveltejs/kit';
import { tokenCreateSchema } from '$lib/schemas';
import type { RequestHandler } from './$types';
import { api, fail4xx, readJson } from '$lib/server/api';
import { requireUser } from '$lib/server/workspaces/access';
import * as apiTokens from '$lib/server/accounts/apiTokens';
import { db } from '$lib/server/db';

export const GET = api<RequestHandler>(async ({ locals }) => {
	const user = requireUser(locals);
	const tokens = await apiTokens.list(db(), user.id);
	return json({ tokens: tokens.map((t) => ({ id: t.id, name: t.name, prefix: t.prefix, createdAt: t.created_at, lastUsedAt: t.last_used_at })) });
});

export const POST = api<RequestHandler>(async (event) => {
	const user = requireUser(event.locals);
	// A token cannot mint tokens: a leaked one stays contained.
	if (event.locals.viaToken) fail4xx(403, 'API tokens are created from a signed-in session, not with another token');
	const { name } = await readJson(event, tokenCreateSchema);
	const created = await apiTokens.create(db(), user.id, name);
	return json(created, { status: 201 });
});
