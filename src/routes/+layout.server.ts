import { mailViewerEnabled } from '$lib/server/mail';
import type { LayoutServerLoad } from './$types';

export const load = (({ locals }) => ({
	user: locals.user ? { name: locals.user.name, email: locals.user.email } : null,
	mailbox: mailViewerEnabled()
})) satisfies LayoutServerLoad;
