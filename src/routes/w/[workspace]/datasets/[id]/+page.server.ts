import { fail, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { roleAtLeast } from '$lib/server/workspaces/access';
import { fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import { datasetAccess, datasetJson } from '$lib/server/datasets/access';
import * as datasetStore from '$lib/server/datasets/store';
import { formAction } from '$lib/server/forms';
import type { Actions, PageServerLoad } from './$types';

/** The dataset, reached through its own workspace's URL (another slug is a 404). */
async function access(locals: App.Locals, params: { workspace: string; id: string }, need: 'viewer' | 'editor') {
	const found = await datasetAccess(locals, params.id, need);
	if (found.access.workspace.slug !== params.workspace) fail4xx(404, 'no such dataset');
	return found;
}

export const load = (async ({ locals, params, url }) => {
	if (!locals.user) redirect(303, `/login?next=${encodeURIComponent(url.pathname)}`);
	const { access: a, dataset } = await access(locals, params, 'viewer');
	const [versions, studyCount] = await Promise.all([datasetStore.versions(db(), dataset.workspaceId, dataset.name), datasetStore.studyCount(db(), dataset.id)]);
	return {
		workspace: { slug: a.workspace.slug, name: a.workspace.name },
		canEdit: roleAtLeast(a.role, 'editor'),
		dataset: datasetJson(dataset),
		versions,
		studyCount
	};
}) satisfies PageServerLoad;

const archiveSchema = z.object({ archived: z.enum(['true', 'false'], { error: 'archived must be true or false' }) });

export const actions = {
	archive: async ({ request, locals, params }) => {
		const { dataset } = await access(locals, params, 'editor');
		return formAction(request, archiveSchema, async ({ archived }) => {
			await datasetStore.setArchived(db(), dataset.id, archived === 'true');
			return { archived: archived === 'true' };
		});
	},
	delete: async ({ locals, params }) => {
		const { dataset, access: a } = await access(locals, params, 'editor');
		const result = await datasetStore.remove(db(), dataset.id);
		if (result === 'in-use') {
			return fail(409, { message: `"${dataset.name}" version ${dataset.version} is used by a study, so it cannot be deleted; archive it instead` });
		}
		redirect(303, `/w/${a.workspace.slug}`);
	}
} satisfies Actions;
