import { redirect } from '@sveltejs/kit';
import { signUpSchema } from '$lib/schemas';
import { signUp, startSession } from '$lib/server/accounts/service';
import { formAction } from '$lib/server/forms';
import { safeNext } from '$lib/server/safeNext';
import type { Actions, PageServerLoad } from './$types';


export const load = (({ locals, url }) => {
	if (locals.user) redirect(303, '/');
	return { next: safeNext(url.searchParams.get('next'), url.origin), email: url.searchParams.get('email') ?? '' };
}) satisfies PageServerLoad;

export const actions = {
	default: async (event) => {
		const result = await formAction(event.request, signUpSchema, async (input) => {
			const user = await signUp(input);
			await startSession(event.cookies, user.id, event.locals.session?.id);
			return { ok: true as const };
		});
		if ('ok' in result) redirect(303, safeNext(event.url.searchParams.get('next'), event.url.origin));
		return result;
	}
} satisfies Actions;
