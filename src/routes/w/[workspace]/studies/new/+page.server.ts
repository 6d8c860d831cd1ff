import { redirect } from '@sveltejs/kit';
import { curveMethods } from '$lib/numerics/fits';
import { workspaceAccess } from '$lib/server/workspaces/access';
import { fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import { buildFitsOnThread } from '$lib/server/offload/pool';
import * as datasetStore from '$lib/server/datasets/store';
import { formAction } from '$lib/server/forms';
import { queueReady } from '$lib/server/studies/queue/appWorkers';
import { StudyRejected, launchStudy } from '$lib/server/studies/launch';
import { BUDGET_LIMITS, DEFAULT_BUDGETS, CURVE_FIT_METHODS, FORM_FIT_OPTIONS, MAX_STARTS, OPTIMIZER_NAMES, studyFormSchema } from '$lib/server/studies/launchRequest';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, params, url }) => {
	if (!locals.user) redirect(303, `/login?next=${encodeURIComponent(url.pathname)}`);
	const { workspace } = await workspaceAccess(locals, params.workspace, 'editor');
	const datasets = await datasetStore.listForWorkspace(db(), workspace.id);
	return {
		workspace: { slug: workspace.slug, name: workspace.name },
		datasets: datasets.map((d) => ({ id: d.id, name: d.name, version: d.version, shape: d.shape, rowCount: d.rowCount, columns: d.columns, description: d.description })),
		preselect: url.searchParams.get('dataset'),
		fits: CURVE_FIT_METHODS.map((m) => ({ method: m, continuity: curveMethods[m].continuity, options: FORM_FIT_OPTIONS[m] ?? [] })),
		optimizers: OPTIMIZER_NAMES,
		limits: { starts: MAX_STARTS, budgets: BUDGET_LIMITS, defaults: DEFAULT_BUDGETS }
	};
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ request, locals, params, url }) => {
		const { workspace, user } = await workspaceAccess(locals, params.workspace, 'editor');
		const result = await formAction(request, studyFormSchema, async (input) => {
			const workers = await queueReady();
			try {
				const { id } = await launchStudy(db(), { workspaceId: workspace.id, userId: user.id, origin: url.origin, input, buildFits: buildFitsOnThread });
				workers.wake();
				return { id };
			} catch (e) {
				if (e instanceof StudyRejected) fail4xx(422, e.details.map((d) => d.problem).join('; '), 'invalid', e.details);
				throw e;
			}
		});
		if ('id' in result) redirect(303, `/w/${workspace.slug}/studies/${result.id}`);
		return result;
	}
} satisfies Actions;
