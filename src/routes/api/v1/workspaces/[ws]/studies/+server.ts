import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx, readJson } from '$lib/server/api';
import { workspaceAccess } from '$lib/server/workspaces/access';
import { db } from '$lib/server/db';
import { buildFitsOnThread } from '$lib/server/offload/pool';
import { queueReady } from '$lib/server/studies/queue/appWorkers';
import { StudyRejected, launchStudy } from '$lib/server/studies/launch';
import { studyInputSchema } from '$lib/server/studies/launchRequest';
import * as studies from '$lib/server/studies/store';

export const GET = api<RequestHandler>(async ({ locals, params }) => {
	const { workspace } = await workspaceAccess(locals, params.ws, 'viewer');
	const list = await studies.listForWorkspace(db(), workspace.id);
	return json({ studies: list });
});

export const POST = api<RequestHandler>(async (event) => {
	const { workspace, user } = await workspaceAccess(event.locals, event.params.ws, 'editor');
	const input = await readJson(event, studyInputSchema);
	const workers = await queueReady();
	try {
		const { id, status, warnings } = await launchStudy(db(), { workspaceId: workspace.id, userId: user.id, origin: event.url.origin, input, buildFits: buildFitsOnThread });
		workers.wake();
		return json({ id, status, warnings }, { status: 202, headers: { location: `/api/v1/studies/${id}` } });
	} catch (e) {
		if (e instanceof StudyRejected) fail4xx(422, `the study cannot run: ${e.message}`, 'invalid', e.details);
		throw e;
	}
});
