import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { api, fail4xx } from '$lib/server/api';
import { db } from '$lib/server/db';
import { studyAccess } from '$lib/server/studies/access';
import { shareSchema } from '$lib/server/studies/schema';
import * as studies from '$lib/server/studies/store';

/** A new read-only link (owners); body `{ expiresInDays? }` (optional). Any earlier link stops working. */
export const POST = api<RequestHandler>(async ({ locals, params, request, url }) => {
	const { study, access } = await studyAccess(locals, params.id, 'owner');
	const text = await request.text();
	let body: unknown = {};
	if (text.trim()) {
		try {
			body = JSON.parse(text);
		} catch {
			fail4xx(400, 'the request body is not valid JSON', 'bad-json');
		}
	}
	const input = shareSchema.parse(body);
	const { token, expiresAt } = await studies.createShare(db(), study.id, access.user.id, input.expiresInDays);
	return json({ token, url: `${url.origin}/shared/${token}`, expiresAt }, { status: 201 });
});

/** Revoke the study's link: it stops working on the next request. */
export const DELETE = api<RequestHandler>(async ({ locals, params }) => {
	const { study } = await studyAccess(locals, params.id, 'owner');
	await studies.revokeShares(db(), study.id);
	return new Response(null, { status: 204 });
});
