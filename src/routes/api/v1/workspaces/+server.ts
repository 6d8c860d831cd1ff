import { json } from '@sveltejs/kit';
import { workspaceCreateSchema } from '$lib/schemas';
import type { RequestHandler } from './$types';
import { api, readJson } from '$lib/server/api';
import { requireUser } from '$lib/server/workspaces/access';
import { db } from '$lib/server/db';
import * as workspaces from '$lib/server/workspaces/store';

export const GET = api<RequestHandler>(async ({ locals }) => {
	const user = requireUser(locals);
	return json({ workspaces: await workspaces.listForUser(db(), user.id) });
});

export const POST = api<RequestHandler>(async (event) => {
	const user = requireUser(event.locals);
	const { name } = await readJson(event, workspaceCreateSchema);
	return json(await workspaces.create(db(), user.id, name), { status: 201 });
});
