import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { roleSchema } from '$lib/schemas';
import type { RequestHandler } from './$types';
import { api, readJson } from '$lib/server/api';
import { workspaceAccess } from '$lib/server/workspaces/access';
import { db } from '$lib/server/db';
import * as workspaces from '$lib/server/workspaces/store';

export const PATCH = api<RequestHandler>(async (event) => {
	const { workspace } = await workspaceAccess(event.locals, event.params.ws, 'owner');
	const { role } = await readJson(event, z.object({ role: roleSchema }));
	await workspaces.changeMember(db(), workspace.id, event.params.userId, role);
	return json({ userId: event.params.userId, role });
});

export const DELETE = api<RequestHandler>(async ({ locals, params }) => {
	const { workspace } = await workspaceAccess(locals, params.ws, 'owner');
	await workspaces.changeMember(db(), workspace.id, params.userId, null);
	return new Response(null, { status: 204 });
});
