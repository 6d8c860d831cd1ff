import { inviteSchema, memberRemoveSchema, memberRoleSchema } from '$lib/schemas';
import { roleAtLeast, workspaceAccess } from '$lib/server/workspaces/access';
import { db } from '$lib/server/db';
import * as datasetStore from '$lib/server/datasets/store';
import * as studyStore from '$lib/server/studies/store';
import { formAction } from '$lib/server/forms';
import { inviteMember } from '$lib/server/workspaces/invitations';
import * as workspaces from '$lib/server/workspaces/store';
import { redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, params, url }) => {
	if (!locals.user) redirect(303, `/login?next=${encodeURIComponent(url.pathname)}`);
	const { workspace, role } = await workspaceAccess(locals, params.workspace, 'viewer');
	const [members, invitations, datasets, studies] = await Promise.all([
		workspaces.members(db(), workspace.id),
		roleAtLeast(role, 'owner') ? workspaces.pendingInvitations(db(), workspace.id) : Promise.resolve([]),
		datasetStore.listForWorkspace(db(), workspace.id),
		studyStore.listForWorkspace(db(), workspace.id, 50)
	]);
	return {
		workspace: { slug: workspace.slug, name: workspace.name },
		role,
		members,
		invitations,
		me: locals.user.email,
		datasets: datasets.map((d) => ({ id: d.id, name: d.name, version: d.version, shape: d.shape, rowCount: d.rowCount, createdAt: d.createdAt })),
		studies
	};
}) satisfies PageServerLoad;

export const actions = {
	invite: async ({ request, locals, params, url }) => {
		const access = await workspaceAccess(locals, params.workspace, 'owner');
		return formAction(request, inviteSchema, async ({ email, role }) => {
			await inviteMember(access, email, role, url.origin);
			return { invited: email };
		});
	},
	setRole: async ({ request, locals, params }) => {
		const { workspace } = await workspaceAccess(locals, params.workspace, 'owner');
		return formAction(request, memberRoleSchema, async ({ userId, role }) => {
			await workspaces.changeMember(db(), workspace.id, userId, role);
			return { changed: true as const };
		});
	},
	remove: async ({ request, locals, params }) => {
		const { workspace } = await workspaceAccess(locals, params.workspace, 'owner');
		return formAction(request, memberRemoveSchema, async ({ userId }) => {
			await workspaces.changeMember(db(), workspace.id, userId, null);
			return { removed: true as const };
		});
	}
} satisfies Actions;
