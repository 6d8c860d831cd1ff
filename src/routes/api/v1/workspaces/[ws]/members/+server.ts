import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api } from '$lib/server/api';
import { workspaceAccess } from '$lib/server/workspaces/access';
import { db } from '$lib/server/db';
import * as workspaces from '$lib/server/workspaces/store';

export const GET = api<RequestHandler>(async ({ locals, params }) => {
	const { workspace } = await workspaceAccess(locals, params.ws, 'viewer');
	const members = await workspaces.members(db(), workspace.id);
	return json({ members: members.map((m) => ({ userId: m.user_id, email: m.email, name: m.name, role: m.role })) });
});
