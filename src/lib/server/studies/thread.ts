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
import config from '../../../../knexfile';
import { fitCurve } from '../../numerics/fits/fitCurve';
import { optimize } from '../../numerics/optimize/optimize';
import { curveProblem } from './problem';
import { runStudyJob, type RunnerContext } from './runner';
import type { StudyJob } from './jobs';

pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));

const data = (workerData ?? {}) as { databaseUrl?: string };
const db = knex({ ...config, connection: data.databaseUrl ?? config.connection, pool: { min: 0, max: 2 } });
const ctx: RunnerContext = { db, worker: `${os.hostname()}/${process.pid}/t${threadId}`, cache: new Map() };

/** A few runs on a small curve so the optimizers' code is compiled before the first real job. */
function warmUp(): void {
	const x = [0, 1, 2, 3, 4, 5, 6, 7];
	const y = x.map((v) => Math.sin(v / 2.5));
	const t0 = Date.now();
	for (const method of ['linear', 'pchip', 'cubic-natural'] as const) {
		const fit = fitCurve(method, x, y);
		const problem = curveProblem(fit, [], { kind: 'maximize', bounds: [[0, 7]], constraints: [] });
		for (const o of ['sqp', 'bfgs', 'conjugate-gradient', 'nelder-mead', 'steepest-descent', 'newton'] as const) {
			for (const s of [0.5, 3.5, 6.5]) optimize(problem, o, { maxMilliseconds: 50 }, [s]);
			if (Date.now() - t0 > 1500) return;
		}
	}
}

parentPort!.on('message', async ({ job, attempt }: { job: StudyJob; attempt: number }) => {
	try {
		const result = await runStudyJob(ctx, job, attempt);
		parentPort!.postMessage({ ok: true, result });
	} catch (e) {
		parentPort!.postMessage({ ok: false, error: e instanceof Error ? e.message : String(e) });
	}
});

try {
	warmUp();
} catch {
	// warming is an optimisation only
}
parentPort!.postMessage({ ready: true });
