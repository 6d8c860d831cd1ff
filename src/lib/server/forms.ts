import { fail, isHttpError } from '@sveltejs/kit';
import type { z } from 'zod';
import { zodDetails } from '$lib/schemas';
import { formObject } from './api';
import { findControlCharacter } from '$lib/text';

/**
 * Run a form action: parse the form with the route's zod schema, run `fn`, and
 * turn any 4xx into `fail(status, { message, details, values })` for the page.
 * Passwords are never echoed back.
 */
export async function formAction<S extends z.ZodType, T>(request: Request, schema: S, fn: (input: z.output<S>) => Promise<T>) {
	const raw = formObject(await request.formData());
	const values = Object.fromEntries(Object.entries(raw).filter(([k]) => !/password|token|current/i.test(k)));
	const control = findControlCharacter(raw);
	if (control) {
		const problem = `contains a control character (${control.found}); remove it`;
		return fail(422, { message: `${control.path}: ${problem}`, details: [{ field: control.path, problem }], values: {} as Record<string, string> });
	}
	const parsed = schema.safeParse(raw);
	if (!parsed.success) {
		const details = zodDetails(parsed.error);
		return fail(422, { message: details.map((d) => d.problem).join('; '), details, values });
	}
	try {
		return await fn(parsed.data);
	} catch (e) {
		if (isHttpError(e) && e.status < 500) {
			const body = e.body as App.Error & { details?: unknown };
			return fail(e.status, { message: body.message, details: body.details ?? [], values });
		}
		throw e;
	}
}

/** Mark a failed form action's data with the form it came from (a page with several forms). */
export function fromForm<T>(result: T, form: string): T {
	if (result && typeof result === 'object' && 'status' in result && 'data' in result) {
		const failure = result as { data: Record<string, unknown> };
		failure.data.form = form;
	}
	return result;
}
