import { json, type Handle, type HandleServerError, type ServerInit } from '@sveltejs/kit';
import { auth } from '$lib/server/accounts/auth';
import * as apiTokens from '$lib/server/accounts/apiTokens';
import { databaseUnavailable, errorBody, RETRY_AFTER_SECONDS, unavailableResponse } from '$lib/server/api';
import { controlCharacterIn } from '$lib/text';
import { db } from '$lib/server/db';
import { startCatcher } from '$lib/server/mail';
import { startOffloadThreads } from '$lib/server/offload/pool';
import { startStudyWorkers } from '$lib/server/studies/queue/appWorkers';

export const init: ServerInit = async () => {
	await startCatcher();
	// fit previews, a launch's fit building and upload parsing run on these threads; not awaited
	void startOffloadThreads().catch(() => {});
	// the job queue and study worker threads (KINKLESS_WORKERS=0: none in this process); not awaited
	void startStudyWorkers().catch(() => {});
};

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);
const SIMPLE_BODY = /^(application\/x-www-form-urlencoded|multipart\/form-data|text\/plain)/i;

export const handle: Handle = async ({ event, resolve }) => {
	try {
		return await handleRequest({ event, resolve });
	} catch (e) {
		// the session lookup (or anything before the route) found no database
		if (databaseUnavailable(e)) return unavailable(event.url.pathname.startsWith('/api/'));
		throw e;
	}
};

function unavailable(isApi: boolean): Response {
	if (isApi) return unavailableResponse();
	return new Response('Kinkless cannot reach its database for the moment (it may be restarting). Nothing was changed; reload this page in a few seconds.', {
		status: 503,
		headers: { 'content-type': 'text/plain; charset=utf-8', 'retry-after': String(RETRY_AFTER_SECONDS) }
	});
}

const handleRequest: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.session = null;
	event.locals.viaToken = false;
	event.locals.databaseDown = false;
	const isApi = event.url.pathname.startsWith('/api/');
	// a path (slug, id) with a NUL or other control character names nothing here
	let decodedPath = '';
	try {
		decodedPath = decodeURIComponent(event.url.pathname);
	} catch {
		decodedPath = '\u0000';
	}
	if (controlCharacterIn(decodedPath)) {
		return isApi ? json(errorBody(404, 'not found', 'not-found'), { status: 404 }) : new Response('not found', { status: 404 });
	}

	const authz = event.request.headers.get('authorization');
	const bearer = authz?.toLowerCase().startsWith('bearer ') ?? false;
	// API tokens are for /api/ only. Pages and their form actions (settings, token
	// creation, account changes) need a signed-in session, so a leaked token cannot
	// mint more tokens or change the account.
	if (bearer && !isApi) return new Response('API tokens work only under /api/; sign in to use the pages', { status: 403, headers: { 'content-type': 'text/plain; charset=utf-8' } });
	if (bearer && authz) {
		const user = await apiTokens.authenticate(db(), authz.slice(7).trim());
		if (!user) return json(errorBody(401, 'the API token is unknown or revoked', 'bad-token'), { status: 401 });
		event.locals.user = { id: user.id, email: user.email, name: user.name };
		event.locals.viaToken = true;
	} else {
		// Cross-site request forgery: a request riding on the session cookie must come
		// from our own origin. Token-authenticated requests carry no ambient credential.
		if (!SAFE.has(event.request.method)) {
			const origin = event.request.headers.get('origin');
			const type = event.request.headers.get('content-type') ?? '';
			if ((origin && origin !== event.url.origin) || (!origin && SIMPLE_BODY.test(type))) {
				const message = 'cross-site request refused (the Origin header does not match this server)';
				return isApi ? json(errorBody(403, message, 'cross-site'), { status: 403 }) : new Response(message, { status: 403 });
			}
		}
		const lucia = auth();
		const sessionId = event.cookies.get(lucia.sessionCookieName);
		if (sessionId) {
			const { session, user } = await lucia.validateSession(sessionId);
			if (session?.fresh) {
				const c = lucia.createSessionCookie(session.id);
				event.cookies.set(c.name, c.value, { path: '/', ...c.attributes });
			}
			if (!session) {
				const c = lucia.createBlankSessionCookie();
				event.cookies.set(c.name, c.value, { path: '/', ...c.attributes });
			}
			event.locals.user = user;
			event.locals.session = session;
		}
	}

	let response = await resolve(event);
	// a page whose load found no database: 503 with retry-after, not 500
	if (event.locals.databaseDown && response.status === 500) return unavailable(isApi);
	// methods a route does not have: the API's error shape, with SvelteKit's Allow header
	if (isApi && response.status === 405 && !response.headers.get('content-type')?.includes('json')) {
		const allow = response.headers.get('allow') ?? '';
		response = json(errorBody(405, `${event.request.method} is not allowed here${allow ? `; this path allows ${allow}` : ''}`), { status: 405, headers: allow ? { allow } : {} });
	}
	// The headers every response carries (nosniff, frame and referrer policy, HSTS over
	// https, a default content policy) are set by scripts/serve.mjs, static files included;
	// pages get SvelteKit's content policy (svelte.config.js). Here: nothing a signed-in
	// caller sees, and no API answer, is kept by a shared cache or the browser's history.
	if ((isApi || event.locals.user) && !response.headers.get('cache-control')?.includes('no-store')) {
		response.headers.set('cache-control', 'private, no-store');
	}
	return response;
};

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	if (databaseUnavailable(error)) {
		event.locals.databaseDown = true;
		return { code: 'unavailable', message: 'the database is unavailable for the moment; retry in a few seconds' };
	}
	if (status >= 500) console.error(error);
	return { code: status === 404 ? 'not-found' : 'internal', message: status === 404 ? 'not found' : message };
};
