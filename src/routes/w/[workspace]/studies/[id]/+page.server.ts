import { error, fail, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { CAUTION } from '$lib/caution';
import { roleAtLeast } from '$lib/server/workspaces/access';
import { fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import { formAction } from '$lib/server/forms';
import { studyAccess } from '$lib/server/studies/access';
import { cancelStudy, pickFit } from '$lib/server/studies/commands';
import { pickSchema, shareNamesSchema, shareSchema } from '$lib/server/studies/launchRequest';
import { RANK_RULE } from '$lib/server/studies/scorecard';
import * as studies from '$lib/server/studies/store';
import { studyPage } from '$lib/server/studies/view';
import type { Actions, PageServerLoad } from './$types';

async function open(locals: App.Locals, params: { workspace: string; id: string }, need: 'viewer' | 'editor' | 'owner') {
	const found = await studyAccess(locals, params.id, need);
	// the study's workspace is in the address; another workspace's slug is not found
	if (found.access.workspace.slug !== params.workspace) error(404, { code: 'not-found', message: 'no such study' });
	return found;
}

export const load = (async ({ locals, params, url }) => {
	if (!locals.user) redirect(303, `/login?next=${encodeURIComponent(url.pathname)}`);
	const { study, access } = await open(locals, params, 'viewer');
	const isOwner = roleAtLeast(access.role, 'owner');
	const [page, share] = await Promise.all([studyPage(db(), study), isOwner ? studies.activeShare(db(), study.id) : Promise.resolve(null)]);
	return { workspace: { slug: access.workspace.slug, name: access.workspace.name }, role: access.role, ...page, share, caution: CAUTION, rankRule: RANK_RULE };
}) satisfies PageServerLoad;

const none = z.object({});

export const actions = {
	cancel: async ({ request, locals, params }) => {
		const { study, access } = await open(locals, params, 'editor');
		return formAction(request, none, async () => {
			await cancelStudy(db(), study, access.user.id);
			return { cancelled: true as const };
		});
	},
	pick: async ({ request, locals, params }) => {
		const { study, access } = await open(locals, params, 'editor');
		const result = await formAction(request, pickSchema, async (input) => {
			await pickFit(db(), study, access.user.id, input);
			return { picked: true as const };
		});
		// tell the page which form was refused, so the problem shows beside that form's field
		return 'status' in result ? fail(result.status, { ...result.data, action: 'pick' as const }) : result;
	},
	share: async ({ request, locals, params, url }) => {
		const { study, access } = await open(locals, params, 'owner');
		return formAction(request, shareSchema, async ({ expiresInDays, showNames }) => {
			const { token } = await studies.createShare(db(), study.id, access.user.id, expiresInDays, showNames ?? false);
			return { shareUrl: `${url.origin}/shared/${token}` };
		});
	},
	shareNames: async ({ request, locals, params }) => {
		const { study } = await open(locals, params, 'owner');
		return formAction(request, shareNamesSchema, async ({ showNames }) => {
			if (!(await studies.setShareNames(db(), study.id, showNames))) fail4xx(404, 'this study has no live share link; create one first', 'no-share');
			return { shareNames: showNames };
		});
	},
	unshare: async ({ request, locals, params }) => {
		const { study } = await open(locals, params, 'owner');
		return formAction(request, none, async () => {
			await studies.revokeShares(db(), study.id);
			return { revoked: true as const };
		});
	}
} satisfies Actions;
