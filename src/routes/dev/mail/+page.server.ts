import { error, redirect } from '@sveltejs/kit';
import { catchingMail, listCaught } from '$lib/server/mail';
import type { PageServerLoad } from './$types';

// The local catcher's inbox. It exists only while mail is caught (no SMTP_URL):
// with a real mail server configured, this page is a 404.
export const load = (async ({ locals, url }) => {
	if (!catchingMail()) error(404, { code: 'not-found', message: 'not found' });
	if (!locals.user) redirect(303, `/login?next=${encodeURIComponent(url.pathname)}`);
	const messages = await listCaught(100);
	return { messages: messages.map((m) => ({ ...m, received_at: m.received_at.toISOString() })) };
}) satisfies PageServerLoad;
