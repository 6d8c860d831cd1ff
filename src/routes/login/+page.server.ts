import { redirect } from '@sveltejs/kit';
import { signInSchema } from '$lib/schemas';
import { signIn, startSession } from '$lib/server/accounts/service';
import { formAction } from '$lib/server/forms';
import { safeNext } from '$lib/server/safeNext';
import type { Actions, PageServerLoad } from './$types';


export const load = (({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next'), url.origin));
	return { next: safeNext(url.searchParams.get('next'), url.origin) };
}) satisfies PageServerLoad;

export const actions = {
	default: async (event) => {
		const result = await formAction(event.request, signInSchema, async (input) => {
			const user = await signIn(input, event.getClientAddress(), event.cookies);
			await startSession(event.cookies, user.id, event.locals.session?.id);
			return { ok: true as const };
		});
		if ('ok' in result) redirect(303, safeNext(event.url.searchParams.get('next'), event.url.origin));
		return result;
	}
} satisfies Actions;
