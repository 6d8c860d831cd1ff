// The app process's study workers, started from hooks.server.ts `init`.
// KINKLESS_WORKERS threads (default: one per core; 0 computes nothing here,
// leaving the work to `npm run worker` processes).
import config from '../../../../../knexfile';
import { fail4xx } from '../../api';
import { db } from '../../db';
import { queueName } from './boss';
import { currentWorkers, defaultThreads, processWorkers, type StudyWorkers } from './workers';

export function startStudyWorkers(): Promise<StudyWorkers> {
	const started = processWorkers(() => ({ databaseUrl: String(config.connection), db: db(), threads: defaultThreads(), queue: queueName(), root: process.cwd() }));
	started.then(
		(w) => {
			console.log(`kinkless: study workers: ${w.pool?.size ?? 0} thread${w.pool?.size === 1 ? '' : 's'} on queue "${queueName()}"`);
			process.once('sveltekit:shutdown' as 'beforeExit', () => void w.stop());
		},
		(e) => console.error(`kinkless: the study queue did not start: ${(e as Error).message}`)
	);
	return started;
}

/** The queue must be up before a study is launched (it creates the queues). */
export async function queueReady(): Promise<StudyWorkers> {
	try {
		return await (currentWorkers() ?? startStudyWorkers());
	} catch {
		return fail4xx(503, 'the study queue is not available; try again in a moment', 'unavailable');
	}
}
