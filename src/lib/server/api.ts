import { error, isHttpError, json, type RequestEvent, type RequestHandler } from '@sveltejs/kit';
import { findControlCharacter } from '$lib/text';
import { z } from 'zod';
import { zodDetails } from '$lib/schemas';

export type ErrorDetail = { row?: number; column?: string; field?: string; problem: string };

const CODES: Record<number, string> = {
	400: 'bad-request',
	401: 'unauthenticated',
	403: 'forbidden',
	404: 'not-found',
	409: 'conflict',
	405: 'method-not-allowed',
	413: 'too-large',
	415: 'unsupported-media-type',
	422: 'invalid',
	429: 'rate-limited',
	500: 'internal',
	503: 'unavailable'
};

/** Throw from anywhere (loads, actions, API routes): one error shape for all. */
export function fail4xx(status: number, message: string, code = CODES[status] ?? 'error', details?: ErrorDetail[]): never {
	error(status, { code, message, ...(details ? { details } : {}) } as App.Error);
}

export function errorBody(status: number, message: string, code?: string, details?: ErrorDetail[]) {
	return { error: { code: code ?? CODES[status] ?? 'error', message, ...(details?.length ? { details } : {}) } };
}

/** Wrap an API handler: every thrown error becomes `{ error: { code, message, details? } }`. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export function api<H extends RequestHandler<any, any>>(handler: H): H {
	return (async (event: Parameters<H>[0]) => {
		try {
			return await handler(event);
		} catch (e) {
			if (isHttpError(e)) {
				const body = e.body as App.Error & { details?: ErrorDetail[] };
				return json(errorBody(e.status, body.message, body.code, body.details), { status: e.status });
			}
			if (e instanceof z.ZodError) return json(errorBody(422, 'the request is not valid', 'invalid', zodDetails(e)), { status: 422 });
			if (databaseUnavailable(e)) return unavailableResponse();
			console.error(e);
			return json(errorBody(500, 'internal error'), { status: 500 });
		}
	}) as H;
}

/** 415 unless the body is declared as JSON (a request without a content-type is read as JSON). */
export function requireJsonType(request: Request): void {
	const type = request.headers.get('content-type');
	if (type && !/^application\/([\w.+-]+\+)?json\s*(;|$)/i.test(type)) {
		fail4xx(415, `send the body as JSON with content-type: application/json (this request says ${clip(type)})`, 'unsupported-media-type');
	}
}

const clip = (s: string) => (s.length > 80 ? `${s.slice(0, 80)}…` : s);

/** A database that cannot be reached right now (restarting, refusing connections, pool starved). */
export function databaseUnavailable(e: unknown): boolean {
	const err = e as { code?: string; message?: string } | null;
	if (!err) return false;
	const code = String(err.code ?? '');
	// 57P01–57P03: admin shutdown, crash shutdown, cannot connect now; class 08: connection exceptions
	if (['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', '57P01', '57P02', '57P03'].includes(code) || code.startsWith('08')) return true;
	return /Knex: Timeout acquiring a connection|Connection terminated|terminating connection due to administrator command|the database system is (starting up|shutting down)/i.test(err.message ?? '');
}

/** Seconds a client should wait before retrying while the database is unavailable. */
export const RETRY_AFTER_SECONDS = 5;

export function unavailableResponse(): Response {
	return json(errorBody(503, `the database is unavailable for the moment (restarting?); nothing was changed, retry in ${RETRY_AFTER_SECONDS} seconds`, 'unavailable'), {
		status: 503,
		headers: { 'retry-after': String(RETRY_AFTER_SECONDS) }
	});
}

/** Parse a JSON body against a schema; 415 for another media type, 400 for broken JSON, 422 naming each bad field. */
export async function readJson<S extends z.ZodType>(event: RequestEvent, schema: S): Promise<z.output<S>> {
	requireJsonType(event.request);
	let body: unknown;
	try {
		body = await event.request.json();
	} catch {
		fail4xx(400, 'the request body is not valid JSON', 'bad-json');
	}
	const control = findControlCharacter(body);
	if (control) fail4xx(422, `the request is not valid: ${control.path}: contains a control character (${control.found}); remove it`, 'invalid', [{ field: control.path, problem: `contains a control character (${control.found})` }]);
	const parsed = schema.safeParse(body);
	if (!parsed.success) fail4xx(422, 'the request is not valid: ' + parsed.error.issues.map((i) => `${i.path.join('.') || 'body'}: ${i.message}`).join('; '), 'invalid', zodDetails(parsed.error));
	return parsed.data;
}

/** Form data → plain object for a shared zod schema. */
export function formObject(data: FormData): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [k, v] of data) if (typeof v === 'string') out[k] = v;
	return out;
}
