import { redirect } from '@sveltejs/kit';
import { fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import * as workspaces from '$lib/server/workspaces/store';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ params, locals }) => {
	const state = await workspaces.findInvitation(db(), params.token);
	if (!state.ok) return { problem: workspaces.INVITATION_MESSAGES[state.reason], invitation: null, signedIn: !!locals.user };
	const { invitation } = state;
	return {
		problem: null,
		invitation: { email: invitation.email, role: invitation.role, workspace: invitation.workspace_name, inviter: invitation.inviter },
		signedIn: !!locals.user,
		signedInAs: locals.user?.email ?? null,
		addressMatches: locals.user ? workspaces.sameAddress(locals.user.email, invitation.email) : false
	};
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ params, locals }) => {
		if (!locals.user) redirect(303, `/login?next=${encodeURIComponent(`/invite/${params.token}`)}`);
		const state = await workspaces.acceptInvitation(db(), params.token, locals.user);
		if (!state.ok && state.reason === 'other-address') fail4xx(403, `${workspaces.INVITATION_MESSAGES[state.reason]}; you are signed in as ${locals.user.email}`, 'invitation-other-address');
		if (!state.ok) fail4xx(400, workspaces.INVITATION_MESSAGES[state.reason], `invitation-${state.reason}`);
		redirect(303, `/w/${state.invitation.workspace_slug}`);
	}
} satisfies Actions;
