/**
 * An offload thread: takes one task (a fit, a table to read) at a time from its pool (./pool.ts) and
 * answers with plain data. Loaded by scripts/offload-thread.mjs through tsx, hence
 * relative imports only.
 */
import { parentPort } from 'node:worker_threads';
import { runFitTask, type FitTask } from './fitWork';
import { parseTableTask, type ParseTask } from './tableWork';

parentPort!.on('message', async (task: FitTask | ParseTask) => {
	try {
		const result = task.kind === 'parse' ? await parseTableTask(task) : runFitTask(task);
		parentPort!.postMessage({ ok: true, result });
	} catch (e) {
		parentPort!.postMessage({ ok: false, error: e instanceof Error ? e.message : String(e) });
	}
});
parentPort!.postMessage({ ready: true });
