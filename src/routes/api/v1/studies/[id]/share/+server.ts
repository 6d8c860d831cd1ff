import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import { studyAccess } from '$lib/server/studies/access';
import { shareNamesSchema, shareSchema } from '$lib/server/studies/launchRequest';
import * as studies from '$lib/server/studies/store';

async function optionalJson(request: Request): Promise<unknown> {
	const text = await request.text();
	if (!text.trim()) return {};
	try {
		return JSON.parse(text);
	} catch {
		fail4xx(400, 'the request body is not valid JSON', 'bad-json');
	}
}

/**
 * A new read-only link (owners); body `{ expiresInDays?, showNames? }`
 * (optional). Member names stay hidden from link holders unless `showNames`
 * is true. Any earlier link stops working.
 */
export const POST = api<RequestHandler>(async ({ locals, params, request, url }) => {
	const { study, access } = await studyAccess(locals, params.id, 'owner');
	const input = shareSchema.parse(await optionalJson(request));
	const { token, expiresAt, showNames } = await studies.createShare(db(), study.id, access.user.id, input.expiresInDays, input.showNames ?? false);
	return json({ token, url: `${url.origin}/shared/${token}`, expiresAt, showNames }, { status: 201 });
});

/** Show or hide member names on the live link (owners); body `{ showNames }`. */
export const PATCH = api<RequestHandler>(async ({ locals, params, request }) => {
	const { study } = await studyAccess(locals, params.id, 'owner');
	const { showNames } = shareNamesSchema.parse(await optionalJson(request));
	if (!(await studies.setShareNames(db(), study.id, showNames))) fail4xx(404, 'this study has no live share link; create one first', 'no-share');
	return json({ showNames });
});

/** Revoke the study's link: it stops working on the next request. */
export const DELETE = api<RequestHandler>(async ({ locals, params }) => {
	const { study } = await studyAccess(locals, params.id, 'owner');
	await studies.revokeShares(db(), study.id);
	return new Response(null, { status: 204 });
});
