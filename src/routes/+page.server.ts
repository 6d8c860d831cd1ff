import { redirect } from '@sveltejs/kit';
import { workspaceCreateSchema } from '$lib/schemas';
import { requireUser } from '$lib/server/workspaces/access';
import { db } from '$lib/server/db';
import { formAction } from '$lib/server/forms';
import * as workspaces from '$lib/server/workspaces/store';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals }) => {
	if (!locals.user) return { workspaces: null, recentStudies: [] };
	const [mine, recentStudies] = await Promise.all([workspaces.listForUser(db(), locals.user.id), workspaces.recentStudies(db(), locals.user.id)]);
	return { workspaces: mine, recentStudies };
}) satisfies PageServerLoad;

export const actions = {
	createWorkspace: async ({ request, locals }) => {
		const user = requireUser(locals);
		const result = await formAction(request, workspaceCreateSchema, ({ name }) => workspaces.create(db(), user.id, name));
		if ('slug' in result) redirect(303, `/w/${result.slug}`);
		return result;
	}
} satisfies Actions;
