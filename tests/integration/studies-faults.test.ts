// Faults: a worker process killed mid-study (the study still finishes, every
// run stored once) and a study cancelled while it runs (ends cancelled with
// the runs already stored). Real server, real database, real queue.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import type PgBoss from 'pg-boss';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startBoss } from '../../src/lib/server/studies/queue/boss';
import { launchStudy } from '../../src/lib/server/studies/launch';
import { studyInputSchema } from '../../src/lib/server/studies/launchRequest';
import { caughtMail, json, testDb } from './client';
import { dataset, launch, team, waitFor, type ErrorBody } from './studiesFixtures';

let t: Awaited<ReturnType<typeof team>>;
let datasetId: string;
const children = new Set<ChildProcess>();
let boss: PgBoss | null = null;

beforeAll(async () => {
	t = await team('fault');
	datasetId = await dataset(t.editor.client, t.ws.slug);
});

afterAll(async () => {
	for (const c of children) killGroup(c, 'SIGTERM');
	await boss?.stop({ graceful: false, timeout: 1000 }).catch(() => {});
	await testDb().destroy();
});

function killGroup(c: ChildProcess, signal: NodeJS.Signals) {
	try {
		process.kill(-c.pid!, signal);
	} catch {
		// already gone
	}
}

/** `npm run worker`'s process, started the way the script starts it, on its own queue. */
function startWorker(queue: string, threads: number): ChildProcess {
	const c = spawn('npx', ['tsx', 'scripts/worker.ts'], {
		env: { ...process.env, KINKLESS_QUEUE: queue, KINKLESS_WORKERS: String(threads), KINKLESS_JOB_SOFT_SECONDS: '3', KINKLESS_QUEUE_MAINTENANCE_SECONDS: '2' },
		detached: true, // its own process group, so npx, tsx and node die together
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let out = '';
	c.stdout!.on('data', (d) => (out += d));
	c.stderr!.on('data', (d) => (out += d));
	c.on('exit', () => children.delete(c));
	(c as ChildProcess & { output: () => string }).output = () => out;
	children.add(c);
	return c;
}

const runCount = async (id: string) => Number((await testDb()('study_runs').where({ study_id: id }).count<{ n: number }[]>('* as n'))[0].n);

async function until<T>(what: string, fn: () => Promise<T | null | false>, timeoutMs: number): Promise<T> {
	const t0 = Date.now();
	for (;;) {
		const v = await fn();
		if (v) return v;
		if (Date.now() - t0 > timeoutMs) throw new Error(`timed out waiting for ${what}`);
		await new Promise((r) => setTimeout(r, 200));
	}
}

describe('a worker process killed mid-study', () => {
	it('leaves a study that still finishes, with every run stored once', { timeout: 180_000 }, async () => {
		// A queue of its own, so only the worker processes started here take this study's jobs.
		const queue = `studies-test-${randomBytes(4).toString('hex')}`;
		process.env.KINKLESS_JOB_SOFT_SECONDS = '3';
		boss = await startBoss(process.env.DATABASE_URL!, queue, () => {});
		const input = studyInputSchema.parse({
			name: 'Killed worker',
			datasetId,
			output: 'eta',
			problem: { kind: 'maximize' },
			fits: [{ method: 'linear' }, { method: 'pchip' }, { method: 'akima' }, { method: 'cubic-natural' }],
			optimizers: [{ method: 'sqp' }, { method: 'nelder-mead' }],
			starts: { latinHypercube: 1000, seed: 5 },
			budgets: { maxMilliseconds: 200 }
		});
		const { id, runs } = await launchStudy(testDb(), { workspaceId: t.ws.id, userId: t.editor.id, origin: process.env.KINKLESS_TEST_URL!, input, queue });
		expect(runs).toBe(8000);

		// Kill a worker outright while it holds a job (a job's runs are stored when it ends, so
		// the kill must land inside one): wait until it has stored some runs and holds a job.
		const activeJobs = async () => Number((await testDb().raw(`SELECT count(*)::int AS n FROM pgboss.job WHERE name = ? AND state = 'active'`, [queue])).rows[0].n);
		let stranded = 0;
		for (let attempt = 0; attempt < 3 && stranded === 0; attempt++) {
			const first = startWorker(queue, 1);
			const before = await runCount(id);
			await until('a worker to store runs and hold a job', async () => (await runCount(id)) >= before + 200 && (await activeJobs()) >= 1, 90_000);
			killGroup(first, 'SIGKILL');
			await new Promise((r) => setTimeout(r, 300));
			stranded = await activeJobs(); // held by a dead process until it expires
		}
		expect(stranded).toBeGreaterThanOrEqual(1);
		expect(await runCount(id)).toBeLessThan(8000);

		const second = startWorker(queue, 2);
		const s = await until(
			'the study to finish on the second worker',
			async () => {
				const row = await testDb()('studies').where({ id }).first('status', 'runs_done', 'error');
				return row.status !== 'queued' && row.status !== 'running' ? row : null;
			},
			150_000
		);
		expect(s.status, s.error ?? (second as ChildProcess & { output: () => string }).output()).toBe('done');
		const { rows } = await testDb().raw(
			`SELECT count(*)::int AS n, count(DISTINCT (fit_id, optimizer, start_index))::int AS distinct, count(DISTINCT split_part(worker, '/', 2))::int AS processes FROM study_runs WHERE study_id = ?`,
			[id]
		);
		expect(rows[0]).toMatchObject({ n: 8000, distinct: 8000 });
		expect(rows[0].processes).toBeGreaterThanOrEqual(2); // the killed worker's runs and the second worker's
		expect(s.runs_done).toBe(8000);
		// the API sees the same
		const api = await json<{ status: string; progress: { done: number; total: number } }>(await t.viewer.client.get(`/api/v1/studies/${id}`));
		expect(api).toMatchObject({ status: 'done', progress: { done: 8000, total: 8000 } });
		killGroup(second, 'SIGTERM');
	});
});

describe('cancelling a study while it runs', () => {
	it('ends it cancelled, keeps the runs already stored, and stores no more', { timeout: 120_000 }, async () => {
		const id = await launch(t.editor.client, t.ws.slug, {
			name: 'Cancelled',
			datasetId,
			output: 'eta',
			problem: { kind: 'maximize' },
			fits: [{ method: 'linear' }, { method: 'pchip' }, { method: 'akima' }, { method: 'cubic-natural' }, { method: 'softened-linear' }],
			optimizers: [{ method: 'sqp' }, { method: 'bfgs' }, { method: 'nelder-mead' }],
			starts: { latinHypercube: 1000, seed: 2 }
		});
		await waitFor(t.editor.client, id, (s) => s.progress.done > 0 || s.status !== 'queued' && s.status !== 'running');
		const r = await t.editor.client.post(`/api/v1/studies/${id}/cancel`);
		expect(r.status).toBe(200);
		expect(await json(r)).toEqual({ id, status: 'cancelled' });

		// in-flight batches see the cancellation when they try to store
		await new Promise((res) => setTimeout(res, 2500));
		const settled = await runCount(id);
		await new Promise((res) => setTimeout(res, 2500));
		expect(await runCount(id)).toBe(settled);

		const s = await waitFor(t.viewer.client, id);
		expect(s.status).toBe('cancelled');
		expect(s.progress.done).toBe(settled);
		expect(s.progress.total).toBe(15_000);
		expect(settled).toBeGreaterThan(0);
		expect(settled).toBeLessThan(15_000);
		const runs = await json<{ runs: unknown[] }>(await t.viewer.client.get(`/api/v1/studies/${id}/runs`));
		expect(runs.runs).toHaveLength(settled);

		const again = await t.editor.client.post(`/api/v1/studies/${id}/cancel`);
		expect(again.status).toBe(409);
		expect((await json<ErrorBody>(again)).error.message).toMatch(/already ended \(cancelled\)/);
	});

	it('frees the worker threads at once: no job of the cancelled study waits or runs, and the next study is not queued behind it', { timeout: 120_000 }, async () => {
		const big = await launch(t.editor.client, t.ws.slug, {
			name: 'Cancelled at once',
			datasetId,
			output: 'eta',
			problem: { kind: 'maximize' },
			fits: [{ method: 'linear' }, { method: 'pchip' }, { method: 'akima' }, { method: 'cubic-natural' }, { method: 'softened-linear' }],
			optimizers: [{ method: 'sqp' }, { method: 'bfgs' }, { method: 'nelder-mead' }],
			starts: { latinHypercube: 1000, seed: 4 }
		});
		await waitFor(t.editor.client, big, (s) => s.progress.done > 0 || (s.status !== 'queued' && s.status !== 'running'));
		const jobsOf = async (states: string[]) =>
			Number((await testDb().raw(`SELECT count(*) AS n FROM pgboss.job WHERE data->>'studyId' = ? AND state::text = ANY(?)`, [big, states])).rows[0].n);
		expect(await jobsOf(['created', 'retry'])).toBeGreaterThan(10);
		expect((await t.editor.client.post(`/api/v1/studies/${big}/cancel`)).status).toBe(200);
		// the waiting jobs went with the cancellation, in the same transaction
		expect(await jobsOf(['created', 'retry'])).toBe(0);
		// jobs in flight stop between two starts (checked every 100 ms): give them 3 s
		let active = await jobsOf(['active']);
		for (let i = 0; i < 30 && active > 0; i++) {
			await new Promise((res) => setTimeout(res, 100));
			active = await jobsOf(['active']);
		}
		expect(active).toBe(0);
		// a small study launched now runs on the freed threads (before the fix it waited for
		// every job of the cancelled study to be fetched and skipped)
		const small = await launch(t.editor.client, t.ws.slug, {
			name: 'After the cancel',
			datasetId,
			output: 'eta',
			problem: { kind: 'maximize' },
			fits: [{ method: 'pchip' }],
			optimizers: [{ method: 'bfgs' }],
			starts: { latinHypercube: 4, seed: 1 }
		});
		const done = await waitFor(t.editor.client, small, undefined, 15_000);
		expect(done.status).toBe('done');
		expect(done.progress).toEqual({ done: 4, total: 4 });
	});
});

describe('a job that keeps failing', () => {
	it('fails its study after its retries, with the error shown on the study and e-mailed', { timeout: 120_000 }, async () => {
		const queue = `studies-test-${randomBytes(4).toString('hex')}`;
		const b = await startBoss(process.env.DATABASE_URL!, queue, () => {});
		try {
			const input = studyInputSchema.parse({
				name: 'Broken fit file',
				datasetId,
				output: 'eta',
				problem: { kind: 'maximize' },
				fits: [{ method: 'pchip' }, { method: 'akima' }],
				optimizers: [{ method: 'sqp' }],
				starts: { grid: 5 }
			});
			const { id } = await launchStudy(testDb(), { workspaceId: t.ws.id, userId: t.editor.id, origin: process.env.KINKLESS_TEST_URL!, input, queue });
			// damage one stored fit before any worker sees it: every job on that fit now throws
			await testDb()('study_fits').where({ study_id: id, position: 1 }).update({ fit: JSON.stringify({ format: 'not a fit file' }) });
			startWorker(queue, 1);
			const s = await until(
				'the study to fail',
				async () => {
					const row = await testDb()('studies').where({ id }).first('status', 'error');
					return row.status !== 'queued' && row.status !== 'running' ? row : null;
				},
				100_000
			);
			expect(s.status).toBe('failed');
			const api = await json<{ status: string; error: string }>(await t.viewer.client.get(`/api/v1/studies/${id}`));
			expect(api.status).toBe('failed');
			expect(api.error).toMatch(/fit file/);
			const page = await t.viewer.client.get(`/w/${t.ws.slug}/studies/${id}`);
			expect(await page.text()).toContain('The study failed:');
			const mail = await until(
				'the "study failed" e-mail',
				async () => (await caughtMail(t.editor.email, 20_000)).subject === 'Study failed: Broken fit file' || null,
				30_000
			);
			expect(mail).toBe(true);
		} finally {
			await b.stop({ graceful: false, timeout: 1000 }).catch(() => {});
		}
	});
});
