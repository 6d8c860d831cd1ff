import { fail, redirect } from '@sveltejs/kit';
import { emailChangeSchema, passwordChangeSchema, profileSchema, tokenCreateSchema } from '$lib/schemas';
import { changeEmail, changePassword } from '$lib/server/accounts/service';
import * as apiTokens from '$lib/server/accounts/apiTokens';
import { db } from '$lib/server/db';
import { formAction, fromForm } from '$lib/server/forms';
import * as users from '$lib/server/accounts/users';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, url }) => {
	if (!locals.user) redirect(303, `/login?next=${encodeURIComponent(url.pathname)}`);
	const tokens = await apiTokens.list(db(), locals.user.id);
	return { profile: { name: locals.user.name, email: locals.user.email }, tokens };
}) satisfies PageServerLoad;

export const actions = {
	profile: async ({ request, locals }) => {
		if (!locals.user) redirect(303, '/login');
		const user = locals.user;
		return formAction(request, profileSchema, async ({ name }) => {
			await users.setName(db(), user.id, name);
			return { saved: true as const };
		});
	},
	password: async ({ request, locals, cookies, getClientAddress }) => {
		if (!locals.user) redirect(303, '/login');
		const user = locals.user;
		const sessionId = locals.session?.id ?? null;
		return fromForm(
			await formAction(request, passwordChangeSchema, async ({ current, password }) => {
				await changePassword(user.id, current, password, getClientAddress(), cookies, sessionId);
				return { passwordChanged: true as const };
			}),
			'password'
		);
	},
	email: async ({ request, locals, getClientAddress }) => {
		if (!locals.user) redirect(303, '/login');
		const user = locals.user;
		return fromForm(
			await formAction(request, emailChangeSchema, async ({ current, email }) => {
				const now = await changeEmail(user.id, current, email, getClientAddress());
				return { emailChanged: now };
			}),
			'email'
		);
	},
	createToken: async ({ request, locals }) => {
		if (!locals.user) redirect(303, '/login');
		const user = locals.user;
		return formAction(request, tokenCreateSchema, async ({ name }) => {
			const created = await apiTokens.create(db(), user.id, name);
			return { created: { name, token: created.token } };
		});
	},
	revokeToken: async ({ request, locals }) => {
		if (!locals.user) redirect(303, '/login');
		const id = String((await request.formData()).get('id') ?? '');
		if (!(await apiTokens.revoke(db(), locals.user.id, id))) return fail(404, { message: 'no such token' });
		return { revoked: true as const };
	}
} satisfies Actions;
