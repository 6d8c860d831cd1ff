/**
 * `npm run bench:study`: a study of 12 fits × 3 optimizers × 50 starts on a
 * 200-point curve, from launch to done (queue, worker threads, storage of
 * every run and path), printed as runs per second; then the study page's data
 * for those runs: size and time to build.
 *
 * It starts its own throwaway PostgreSQL (scripts/postgres.mjs) in a temp
 * directory on a free port, so it works on a fresh clone. The curve is
 * INVENTED (a smooth efficiency-like hump with a little ripple), not measured
 * data.
 */
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { benchCluster, benchCurve } from './benchDb';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
process.chdir(root);

const TARGET_RUNS_PER_SECOND = 500;
const PAGE_BYTES_LIMIT = 2 * 1024 * 1024;
const PAGE_MS_LIMIT = 300;

const cluster = await benchCluster();
const { databaseUrl } = cluster;

let exitCode = 0;
try {
	// imported after DATABASE_URL is set: the Knex configuration reads it
	const { default: knex } = await import('knex');
	const { default: pg } = await import('pg');
	const { default: config } = await import('../../knexfile');
	const { launchStudy } = await import('../../src/lib/server/studies/launch');
	const { StudyWorkers, defaultThreads } = await import('../../src/lib/server/studies/queue/workers');
	const { studyInputSchema } = await import('../../src/lib/server/studies/launchRequest');
	const store = await import('../../src/lib/server/studies/store');
	const { studyPage } = await import('../../src/lib/server/studies/view');
	const devalue = await import('devalue');

	pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));
	const db = knex({ ...config, connection: databaseUrl });
	await db.migrate.latest();
	await db('users').insert({ id: 'bench-user', email: 'bench@bench.example', name: 'Bench', password_hash: 'x' });
	const [ws] = await db('workspaces').insert({ slug: 'bench', name: 'Bench', created_by: 'bench-user' }).returning('id');

	const ds = { id: await benchCurve(db, ws.id, 'bench-user', 'Bench curve (invented)') };

	const threads = Math.max(1, defaultThreads());
	const t0 = performance.now();
	const workers = await StudyWorkers.start({ databaseUrl, db, threads, queue: 'studies', root, log: () => {} });
	console.log(
		`study bench: ${threads} worker thread${threads === 1 ? '' : 's'} ready in ${(performance.now() - t0).toFixed(0)} ms (${os.cpus().length} cores; load average ${os.loadavg()[0].toFixed(1)} — other work on the machine slows this down)`
	);

	// every curve method that takes 200 points (a global interpolating polynomial is refused past 40 points;
	// the clamped spline stands in for it, with level end slopes)
	const fits = ['linear', 'cubic-natural', 'cubic-not-a-knot', 'akima', 'akima-modified', 'pchip', 'local-quadratic', 'local-cubic', 'cubic-clamped', 'polynomial-least-squares', 'smoothing-spline', 'softened-linear'].map((method) =>
		method === 'polynomial-least-squares' ? { method, options: { degree: 5 } } : method === 'cubic-clamped' ? { method, options: { slopes: [0, 0] } } : { method }
	);
	const input = studyInputSchema.parse({
		datasetId: ds.id,
		output: 'eta',
		problem: { kind: 'maximize' },
		fits,
		optimizers: [{ method: 'sqp' }, { method: 'bfgs' }, { method: 'nelder-mead' }],
		starts: { latinHypercube: 50, seed: 7 }
	});

	const results: { label: string; runs: number; ms: number }[] = [];
	let lastId = '';
	for (const label of ['first study (threads just started)', 'second study (warm)']) {
		const t1 = performance.now();
		const { id, runs } = await launchStudy(db, { workspaceId: ws.id, userId: 'bench-user', origin: 'http://bench.invalid', input, queue: 'studies' });
		workers.wake();
		const launchMs = performance.now() - t1;

		for (;;) {
			const s = await db('studies').where({ id }).first('status', 'error');
			if (s.status === 'done') break;
			if (s.status === 'failed') throw new Error(`bench study failed: ${s.error}`);
			await new Promise((r) => setTimeout(r, 10));
		}
		const ms = performance.now() - t1;
		const stored = (await db('study_runs').where({ study_id: id }).count('* as n').first())!.n;
		if (Number(stored) !== runs) throw new Error(`${stored} runs stored, expected ${runs}`);
		results.push({ label, runs, ms });
		lastId = id;
		const audits = await db('study_fits').where({ study_id: id }).max('audited_at as last').first();
		const started = await db('studies').where({ id }).first('created_at', 'finished_at');
		const auditsMs = new Date(audits!.last).getTime() - new Date(started.created_at).getTime();
		console.log(
			`study bench: ${label}: ${runs} runs launch→done in ${ms.toFixed(0)} ms = ${((runs / ms) * 1000).toFixed(0)} runs/s (launch request ${launchMs.toFixed(0)} ms; last fit audit stored after ${auditsMs} ms)`
		);
	}

	// the page's data for the last study, built and serialised as SvelteKit does (devalue)
	const times: number[] = [];
	let bytes = 0;
	for (let i = 0; i < 5; i++) {
		const t2 = performance.now();
		const study = (await store.get(db, lastId))!;
		const page = await studyPage(db, study);
		bytes = Buffer.byteLength(devalue.stringify(page));
		times.push(performance.now() - t2);
	}
	times.sort((a, b) => a - b);
	const pageMs = times[Math.floor(times.length / 2)];
	console.log(`study bench: page data for ${results.at(-1)!.runs} runs: ${(bytes / 1024).toFixed(0)} KiB, built and serialised in ${pageMs.toFixed(0)} ms (median of 5; paths not included)`);

	const outcomes = await db('study_runs as r').join('study_fits as f', 'f.id', 'r.fit_id').where('r.study_id', lastId).select('f.method', 'r.outcome').count('* as n').groupBy('f.method', 'r.outcome').orderBy('f.method');
	console.log('study bench: outcomes ' + outcomes.map((o) => `${o.method}/${o.outcome}:${o.n}`).join(' '));

	const worst = Math.min(...results.map((r) => (r.runs / r.ms) * 1000));
	const ok = worst >= TARGET_RUNS_PER_SECOND && bytes <= PAGE_BYTES_LIMIT && pageMs <= PAGE_MS_LIMIT;
	console.log(
		`study bench: ${ok ? 'PASS' : 'FAIL'} — target ≥ ${TARGET_RUNS_PER_SECOND} runs/s launch→done (slowest: ${worst.toFixed(0)}), page data ≤ ${PAGE_BYTES_LIMIT / 1024 / 1024} MB and ≤ ${PAGE_MS_LIMIT} ms`
	);
	if (!ok) exitCode = 1;
	await workers.stop();
	await db.destroy();
} catch (e) {
	console.error(e);
	exitCode = 1;
} finally {
	cluster.stop();
}
process.exit(exitCode);
