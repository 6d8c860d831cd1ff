// A stand-in study thread for the pool test: echoes, crashes or hangs on request.
import { parentPort } from 'node:worker_threads';

parentPort.on('message', ({ job }) => {
	if (job.kind === 'crash') process.exit(3);
	if (job.kind === 'throw') throw new Error('thrown in the thread');
	if (job.kind === 'hang') for (;;);
	parentPort.postMessage({ ok: true, result: { echo: job.value } });
});
parentPort.postMessage({ ready: true });
