import { json } from '@sveltejs/kit';
import { signUpSchema } from '$lib/schemas';
import type { RequestHandler } from './$types';
import { api, readJson } from '$lib/server/api';
import { signUp } from '$lib/server/accounts/service';

export const POST = api<RequestHandler>(async (event) => {
	const input = await readJson(event, signUpSchema);
	const user = await signUp(input);
	return json({ id: user.id, email: user.email }, { status: 201 });
});
