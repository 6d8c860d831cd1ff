import { json } from '@sveltejs/kit';
import { signInSchema } from '$lib/schemas';
import type { RequestHandler } from './$types';
import { api, readJson } from '$lib/server/api';
import { endSession, signIn, startSession } from '$lib/server/accounts/service';

export const POST = api<RequestHandler>(async (event) => {
	const input = await readJson(event, signInSchema);
	const user = await signIn(input, event.getClientAddress(), event.cookies);
	await startSession(event.cookies, user.id, event.locals.session?.id);
	return json({ id: user.id, email: user.email, name: user.name });
});

export const DELETE = api<RequestHandler>(async (event) => {
	await endSession(event.cookies, event.locals.session?.id);
	return new Response(null, { status: 204 });
});
