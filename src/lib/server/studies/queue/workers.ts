/**
 * The job workers of one process (the app, or `npm run worker`).
 *
 * Design: the process's main thread owns pg-boss. It runs one fetch loop per
 * worker thread; a loop takes one job at a time from the queue and hands it to
 * its thread, which computes the runs and stores them itself (its own small
 * database pool), then answers. The loop completes the job, or fails it when
 * the thread threw, crashed or ran out of time — the queue then retries it
 * (another process may take it). A process killed outright leaves its jobs
 * active until they expire (a runs job's expiry is bounded: it hands the rest
 * of its starts to a new job after a soft time limit), and pg-boss's
 * maintenance in any live process puts them back for a retry. A retried job
 * skips runs already stored; inserts are idempotent.
 *
 * Two light loops on the main thread: "study finished" e-mail, and dead
 * letters (a job out of retries marks its study failed with the error).
 */
import os from 'node:os';
import path from 'node:path';
import type PgBoss from 'pg-boss';
import type { Knex } from 'knex';
import { ACTIVE_STATUSES } from '../../../domain/lifecycle';
import { actionMail } from '../../mail';
import { failedQueue, insertJobs, mailQueue, startBoss } from './boss';
import { mailJob, runsExpireSeconds, type MailJob, type StudyJob } from './jobs';
import type { JobResult } from './runner';
import { ThreadPool } from './threadPool';
import { warmUp } from './warmUp';

interface WorkerOptions {
	databaseUrl: string;
	/** the app's Knex handle (for the e-mail and dead-letter loops) */
	db: Knex;
	/** study threads; 0 = this process computes nothing (it still sends e-mail and records failures) */
	threads: number;
	queue: string;
	/** where scripts/study-thread.mjs lives (default: the working directory) */
	root?: string;
	log?: (msg: string) => void;
}

const IDLE_POLL_MS = 1000;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export class StudyWorkers {
	readonly pool: ThreadPool | null;
	private stopping = false;
	private wakers = new Set<() => void>();
	private loops: Promise<void>[] = [];
	private active = new Map<string, string>();
	private log: (msg: string) => void;

	private constructor(
		readonly boss: PgBoss,
		private readonly opts: WorkerOptions
	) {
		this.log = opts.log ?? ((m) => console.log(m));
		const script = path.join(opts.root ?? process.cwd(), 'scripts', 'study-thread.mjs');
		this.pool = opts.threads > 0 ? new ThreadPool(script, opts.threads, { databaseUrl: opts.databaseUrl }, this.log) : null;
	}

	static async start(opts: WorkerOptions): Promise<StudyWorkers> {
		const boss = await startBoss(opts.databaseUrl, opts.queue);
		const w = new StudyWorkers(boss, opts);
		// this thread builds every fit of a study it launches; compile that code now (well under a second)
		setTimeout(() => {
			try {
				warmUp(false, 1000);
			} catch {
				// an optimisation only
			}
		}, 0);
		if (w.pool) await w.pool.ready();
		for (let i = 0; i < opts.threads; i++) w.loops.push(w.studyLoop());
		w.loops.push(w.mailLoop(), w.failedLoop());
		return w;
	}

	/** Look for work now (a study was just launched from this process). */
	wake(): void {
		for (const w of [...this.wakers]) w();
	}

	private idle(ms: number): Promise<void> {
		return new Promise((resolve) => {
			const done = () => {
				clearTimeout(t);
				this.wakers.delete(done);
				resolve();
			};
			const t = setTimeout(done, ms);
			this.wakers.add(done);
		});
	}

	private async fetchOne<T>(queue: string): Promise<PgBoss.JobWithMetadata<T> | null> {
		try {
			const jobs = await this.boss.fetch<T>(queue, { batchSize: 1, includeMetadata: true });
			return jobs[0] ?? null;
		} catch (e) {
			this.log(`kinkless: fetching from ${queue} failed: ${(e as Error).message}`);
			await sleep(IDLE_POLL_MS);
			return null;
		}
	}

	private async studyLoop(): Promise<void> {
		const queue = this.opts.queue;
		while (!this.stopping) {
			const job = await this.fetchOne<StudyJob>(queue);
			if (!job) {
				if (!this.stopping) await this.idle(IDLE_POLL_MS);
				continue;
			}
			this.active.set(job.id, queue);
			try {
				// the thread gets as long as the queue lets the job stay active
				const timeoutMs = 1000 * (Number(job.expireInSeconds) || runsExpireSeconds(2000));
				const result = await this.pool!.run<JobResult>({ job: job.data, attempt: job.retryCount }, timeoutMs);
				await this.boss.complete(queue, job.id, result as unknown as object);
				// more jobs may be waiting: every loop looks again without waiting for its poll
				if (result.continued) this.wake();
			} catch (e) {
				const message = (e as Error).message;
				this.log(`kinkless: study job ${job.id} (${describe(job.data)}) failed, attempt ${job.retryCount + 1} of ${job.retryLimit + 1}: ${message}`);
				await this.boss.fail(queue, job.id, { message }).catch(() => {});
			} finally {
				this.active.delete(job.id);
			}
		}
	}

	private async mailLoop(): Promise<void> {
		const queue = mailQueue(this.opts.queue);
		while (!this.stopping) {
			const job = await this.fetchOne<MailJob>(queue);
			if (!job) {
				if (!this.stopping) await this.idle(2 * IDLE_POLL_MS);
				continue;
			}
			try {
				await sendStudyMail(this.opts.db, job.data);
				await this.boss.complete(queue, job.id);
			} catch (e) {
				this.log(`kinkless: study e-mail failed: ${(e as Error).message}`);
				await this.boss.fail(queue, job.id, { message: (e as Error).message }).catch(() => {});
			}
		}
	}

	private async failedLoop(): Promise<void> {
		const queue = failedQueue(this.opts.queue);
		while (!this.stopping) {
			const job = await this.fetchOne<StudyJob>(queue);
			if (!job) {
				if (!this.stopping) await this.idle(2 * IDLE_POLL_MS);
				continue;
			}
			try {
				const output = (job.output ?? {}) as { message?: string; value?: { message?: string } };
				const message = output.message ?? output.value?.message ?? 'a job of this study failed';
				await markFailed(this.opts.db, job.data.studyId, `${describe(job.data)}: ${message}`, this.opts.queue);
				await this.boss.complete(queue, job.id);
			} catch (e) {
				await this.boss.fail(queue, job.id, { message: (e as Error).message }).catch(() => {});
			}
		}
	}

	/** Stop taking jobs; hand back the ones in progress so another worker retries them at once. */
	async stop(): Promise<void> {
		if (this.stopping) return;
		this.stopping = true;
		this.wake();
		const active = [...this.active];
		await Promise.all(active.map(([id, q]) => this.boss.fail(q, id, { message: 'worker shut down' }).catch(() => {})));
		await this.pool?.close();
		await this.boss.stop({ graceful: false, wait: true, timeout: 1000 }).catch(() => {});
	}
}

function describe(job: StudyJob): string {
	return job.kind === 'audit' ? `audit of fit ${job.fitId}` : `runs of fit ${job.fitId}, starts ${job.from}–${job.to - 1}`;
}

/** Mark a study failed (if it is still queued or running) and queue its e-mail, in one transaction. */
async function markFailed(db: Knex, studyId: string, error: string, queue: string): Promise<boolean> {
	return db.transaction(async (trx) => {
		const n = await trx('studies')
			.where({ id: studyId })
			.whereIn('status', ACTIVE_STATUSES)
			.update({ status: 'failed', error: error.slice(0, 2000), finished_at: trx.fn.now() });
		if (n) await insertJobs(trx, [mailJob(queue, { studyId, event: 'failed' })]);
		return n > 0;
	});
}

async function sendStudyMail(db: Knex, job: MailJob): Promise<void> {
	const s = await db('studies as s')
		.join('workspaces as w', 'w.id', 's.workspace_id')
		.leftJoin('users as u', 'u.id', 's.created_by')
		.where('s.id', job.studyId)
		.first('s.id', 's.name', 's.status', 's.runs_done', 's.runs_total', 's.error', 's.origin', 'w.slug', 'u.email');
	if (!s?.email) return;
	const origin = s.origin || process.env.ORIGIN || `http://127.0.0.1:${process.env.PORT ?? 3000}`;
	const url = `${origin}/w/${s.slug}/studies/${s.id}`;
	const counts = await db('study_runs').where({ study_id: s.id }).select('outcome').count('* as n').groupBy('outcome');
	const summary = counts.map((c) => `${c.n} ${c.outcome}`).join(', ');
	if (job.event === 'done') {
		await actionMail({
			to: s.email,
			subject: `Study finished: ${s.name}`,
			intro: `Your study "${s.name}" has finished: ${s.runs_done} of ${s.runs_total} runs stored (${summary || 'no runs'}). The scorecard ranks the fits; pick one and record why.`,
			actionLabel: 'Open the study',
			url,
			outro: 'Fits and optima are decision aids computed from your data; check them against the source data and your approved methods.'
		});
	} else {
		await actionMail({
			to: s.email,
			subject: `Study failed: ${s.name}`,
			intro: `Your study "${s.name}" failed after ${s.runs_done} of ${s.runs_total} runs: ${s.error ?? 'a job failed'}. The runs already stored are kept.`,
			actionLabel: 'Open the study',
			url
		});
	}
}

// ---------------------------------------------------------------- one set per process

const KEY = Symbol.for('kinkless.studyWorkers');
type Holder = { [KEY]?: Promise<StudyWorkers> };

/** The process's workers, started once (hot reloads and repeated init calls reuse them). */
export function processWorkers(opts: () => WorkerOptions): Promise<StudyWorkers> {
	const g = globalThis as Holder;
	g[KEY] ??= StudyWorkers.start(opts()).catch((e) => {
		delete g[KEY];
		throw e;
	});
	return g[KEY]!;
}

/** The running workers of this process, if any. */
export function currentWorkers(): Promise<StudyWorkers> | null {
	return (globalThis as Holder)[KEY] ?? null;
}

export const defaultThreads = () => {
	const env = process.env.KINKLESS_WORKERS;
	if (env !== undefined && env !== '') {
		const n = Number(env);
		if (!Number.isInteger(n) || n < 0) throw new Error(`KINKLESS_WORKERS must be a whole number ≥ 0, not "${env}"`);
		return n;
	}
	return os.availableParallelism();
};
