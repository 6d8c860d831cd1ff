import { json } from '@sveltejs/kit';
import { inviteSchema } from '$lib/schemas';
import type { RequestHandler } from './$types';
import { api, readJson } from '$lib/server/api';
import { workspaceAccess } from '$lib/server/workspaces/access';
import { inviteMember } from '$lib/server/workspaces/invitations';

export const POST = api<RequestHandler>(async (event) => {
	const access = await workspaceAccess(event.locals, event.params.ws, 'owner');
	const { email, role } = await readJson(event, inviteSchema);
	await inviteMember(access, email, role, event.url.origin);
	return json({ email, role }, { status: 201 });
});
