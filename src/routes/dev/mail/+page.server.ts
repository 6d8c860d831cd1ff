import { error, redirect } from '@sveltejs/kit';
import { listCaughtFor, mailViewerEnabled } from '$lib/server/mail';
import type { PageServerLoad } from './$types';

// The local catcher's inbox, a development tool: a 404 unless mailViewerEnabled()
// (no SMTP_URL, not production, started for local use on a loopback origin), and
// then only the signed-in user's own mail.
export const load = (async ({ locals, url }) => {
	if (!mailViewerEnabled()) error(404, { code: 'not-found', message: 'not found' });
	if (!locals.user) redirect(303, `/login?next=${encodeURIComponent(url.pathname)}`);
	const messages = await listCaughtFor(locals.user.email, 100);
	return { address: locals.user.email, messages: messages.map((m) => ({ ...m, received_at: m.received_at.toISOString() })) };
}) satisfies PageServerLoad;
