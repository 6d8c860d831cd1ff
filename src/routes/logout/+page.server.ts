import { redirect } from '@sveltejs/kit';
import { endSession } from '$lib/server/accounts/service';
import type { Actions, PageServerLoad } from './$types';

export const load = (() => redirect(303, '/')) satisfies PageServerLoad;

export const actions = {
	default: async ({ cookies, locals }) => {
		await endSession(cookies, locals.session?.id);
		redirect(303, '/');
	}
} satisfies Actions;
