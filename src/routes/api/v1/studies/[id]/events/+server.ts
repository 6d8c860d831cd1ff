import type { RequestHandler } from './$types';
import { isActive } from '$lib/domain/lifecycle';
import { api } from '$lib/server/api';
import { studyAccess } from '$lib/server/studies/access';
import { watch } from '$lib/server/studies/progress';

const HEARTBEAT_MS = 15_000;

/**
 * Server-Sent Events while a study runs: `progress` with
 * { status, done, total, audits } whenever it changes, then `end` with the
 * final state when the study is done, failed or cancelled.
 */
export const GET = api<RequestHandler>(async ({ locals, params, request }) => {
	const { study } = await studyAccess(locals, params.id, 'viewer');
	const encoder = new TextEncoder();
	let stop = () => {};
	const stream = new ReadableStream<Uint8Array>({
		start(controller) {
			let closed = false;
			const send = (event: string, data: unknown) => {
				if (!closed) controller.enqueue(encoder.encode(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`));
			};
			const heartbeat = setInterval(() => !closed && controller.enqueue(encoder.encode(': still here\n\n')), HEARTBEAT_MS);
			const unwatch = watch(study.id, (p) => {
				const data = { status: p.status, done: p.done, total: p.total, audits: p.audits, error: p.error };
				send('progress', data);
				if (!isActive(p.status)) {
					send('end', data);
					stop();
					controller.close();
				}
			});
			stop = () => {
				if (closed) return;
				closed = true;
				clearInterval(heartbeat);
				unwatch();
			};
			request.signal.addEventListener('abort', () => stop());
			controller.enqueue(encoder.encode('retry: 2000\n\n'));
		},
		cancel() {
			stop();
		}
	});
	return new Response(stream, { headers: { 'content-type': 'text/event-stream', 'cache-control': 'no-store', 'x-accel-buffering': 'no' } });
});
