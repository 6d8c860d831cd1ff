import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { newPassword } from '$lib/schemas';

import { resetPassword } from '$lib/server/accounts/service';
import { db } from '$lib/server/db';
import { formAction } from '$lib/server/forms';
import * as passwordResets from '$lib/server/accounts/passwordResets';
import type { Actions, PageServerLoad } from './$types';

const schema = z.object({
	password: newPassword,
	// a checkbox: present when ticked
	revokeTokens: z.string().optional().transform((v) => v !== undefined && v !== '')
});

export const load = (async ({ params }) => {
	const state = await passwordResets.check(db(), params.token);
	return { problem: state.ok ? null : passwordResets.MESSAGES[state.reason] };
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ request, params }) => {
		const result = await formAction(request, schema, async ({ password, revokeTokens }) => {
			await resetPassword(params.token, password, { revokeTokens });
			return { done: true as const };
		});
		if ('done' in result) redirect(303, '/login?reset=1');
		return result;
	}
} satisfies Actions;
