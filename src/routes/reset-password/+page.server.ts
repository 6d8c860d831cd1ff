import { resetRequestSchema } from '$lib/schemas';
import { requestPasswordReset } from '$lib/server/accounts/service';
import { formAction } from '$lib/server/forms';
import type { Actions } from './$types';

export const actions = {
	default: async ({ request, url, getClientAddress }) =>
		formAction(request, resetRequestSchema, async ({ email }) => {
			await requestPasswordReset(email, url.origin, getClientAddress());
			return { sent: true as const, email };
		})
} satisfies Actions;
