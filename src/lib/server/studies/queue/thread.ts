/**
 * A study worker thread: receives one job at a time from its pool, computes
 * and stores it with its own small database pool, and answers with the result.
 * Loaded by scripts/study-thread.mjs through tsx, in dev and in the built app
 * alike, hence relative imports only.
 */
import os from 'node:os';
import { parentPort, threadId, workerData } from 'node:worker_threads';
import knex from 'knex';
import pg from 'pg';
import config from '../../../../../knexfile';
import { warmUp } from './warmUp';
import { runStudyJob, type RunnerContext } from './runner';
import type { StudyJob } from './jobs';

pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));

const data = (workerData ?? {}) as { databaseUrl?: string };
const db = knex({ ...config, connection: data.databaseUrl ?? config.connection, pool: { min: 0, max: 2 } });
const ctx: RunnerContext = { db, worker: `${os.hostname()}/${process.pid}/t${threadId}`, cache: new Map() };

parentPort!.on('message', async ({ job, attempt }: { job: StudyJob; attempt: number }) => {
	try {
		const result = await runStudyJob(ctx, job, attempt);
		parentPort!.postMessage({ ok: true, result });
	} catch (e) {
		parentPort!.postMessage({ ok: false, error: e instanceof Error ? e.message : String(e) });
	}
});

try {
	warmUp(true);
} catch {
	// warming is an optimisation only
}
parentPort!.postMessage({ ready: true });
