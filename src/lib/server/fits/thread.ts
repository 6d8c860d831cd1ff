/**
 * A fit thread: takes one fit task at a time from its pool (./pool.ts) and
 * answers with plain data. Loaded by scripts/fit-thread.mjs through tsx, hence
 * relative imports only.
 */
import { parentPort } from 'node:worker_threads';
import { runFitTask, type FitTask } from './work';

parentPort!.on('message', (task: FitTask) => {
	try {
		parentPort!.postMessage({ ok: true, result: runFitTask(task) });
	} catch (e) {
		parentPort!.postMessage({ ok: false, error: e instanceof Error ? e.message : String(e) });
	}
});
parentPort!.postMessage({ ready: true });
