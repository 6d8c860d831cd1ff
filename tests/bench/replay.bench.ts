/**
 * `npm run bench:replay`: the study page's replay at scale.
 *
 *  1. Page data: for every demo study (the seeds) and for a benchmark study of
 *     1,800 runs (6 fits × 3 optimizers × 100 starts on an INVENTED 200-point
 *     curve), the size of the page's data and the time the built server takes
 *     to serve it (`__data.json`, signed in; median of 7). Paths are not in it:
 *     the replay fetches them when shown.
 *  2. Playback: Debian's Chromium plays the lockstep replay of 6 fits with
 *     every path stretched to 200 iterations (served by the browser's request
 *     router from the real path, so the page, its charts and its moving layers
 *     are the real ones), at 8× with loop on and the f′ and f″ panels open,
 *     and counts display frames over 4 s.
 *
 * Targets (the replay issue): ≥ 50 frames per second; page data ≤ 1 MB and
 * ≤ 200 ms to serve for the 1,800-run study. It starts its own throwaway
 * PostgreSQL and the built app (building it when the sources are newer).
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { DEMO_EMAIL, DEMO_PASSWORD, DEMO_WORKSPACE } from '../../seeds/01_demo_accounts';
import { benchCluster, benchCurve, freePort } from './benchDb';

const DEMO = { email: DEMO_EMAIL, password: DEMO_PASSWORD };
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
process.chdir(root);

const TARGET_FPS = 50;
const PAGE_BYTES_LIMIT = 1024 * 1024;
const PAGE_MS_LIMIT = 200;

function newest(p: string): number {
	const s = statSync(p);
	if (!s.isDirectory()) return s.mtimeMs;
	return Math.max(0, ...readdirSync(p).map((e) => newest(path.join(p, e))));
}

function run(cmd: string, args: string[], env: Record<string, string> = {}) {
	const r = spawnSync(cmd, args, { stdio: ['ignore', 'ignore', 'inherit'], env: { ...process.env, ...env } });
	if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed (${r.status})`);
}

const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];

const cluster = await benchCluster();
const { databaseUrl } = cluster;

let server: ChildProcess | null = null;
let exitCode = 0;
try {
	run('npx', ['tsx', 'scripts/db.ts', 'migrate'], { DATABASE_URL: databaseUrl });
	const s0 = performance.now();
	run('npx', ['tsx', 'scripts/db.ts', 'seed'], { DATABASE_URL: databaseUrl });
	console.log(`replay bench: demo data seeded in ${((performance.now() - s0) / 1000).toFixed(1)} s (${os.cpus().length} cores; load average ${os.loadavg()[0].toFixed(1)})`);

	// the 1,800-run study, computed in this process by the job runner (as the seeds do)
	const { default: knex } = await import('knex');
	const { default: pg } = await import('pg');
	const { default: config } = await import('../../knexfile');
	const { launchStudy } = await import('../../src/lib/server/studies/launch');
	const { runStudyJob } = await import('../../src/lib/server/studies/queue/runner');
	const { studyInputSchema } = await import('../../src/lib/server/studies/launchRequest');
	pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));
	const db = knex({ ...config, connection: databaseUrl });
	const ws = await db('workspaces').where({ slug: DEMO_WORKSPACE }).first('id', 'slug');
	const user = await db('users').where({ email: DEMO.email }).first('id');
	if (!ws || !user) throw new Error('the demo workspace or user is missing after seeding');
	const ds = { id: await benchCurve(db, ws.id, user.id, 'Bench curve, 200 points (invented)') };
	const fits = ['linear', 'akima', 'pchip', 'cubic-natural', 'softened-linear', 'smoothing-spline'].map((method) => ({ method }));
	const input = studyInputSchema.parse({
		name: 'Bench: 1,800 runs',
		datasetId: ds.id,
		output: 'eta',
		problem: { kind: 'maximize' },
		fits,
		optimizers: [{ method: 'sqp' }, { method: 'bfgs' }, { method: 'nelder-mead' }],
		starts: { latinHypercube: 100, seed: 7 }
	});
	const s1 = performance.now();
	const { id: benchId, jobs } = await launchStudy(db, { workspaceId: ws.id, userId: user.id, origin: '', input, enqueue: false });
	for (const job of jobs) await runStudyJob({ db, worker: 'bench', sendJobs: null, softMs: Infinity }, job);
	const benchRow = await db('studies').where({ id: benchId }).first('status', 'runs_done');
	if (benchRow.status !== 'done' || benchRow.runs_done !== 1800) throw new Error(`bench study ${benchRow.status} with ${benchRow.runs_done} runs`);
	console.log(`replay bench: 1,800-run study computed in ${((performance.now() - s1) / 1000).toFixed(1)} s`);
	const studies: { id: string; name: string; runs_done: number }[] = await db('studies').where({ workspace_id: ws.id, status: 'done' }).orderBy('created_at').select('id', 'name', 'runs_done');
	await db.destroy();

	// the built app
	const stamp = 'build/.kinkless-build-stamp';
	const sources = Math.max(...['src', 'static', 'svelte.config.js', 'vite.config.ts', 'tailwind.config.js', 'package-lock.json'].map(newest));
	if (!existsSync(stamp) || statSync(stamp).mtimeMs < sources) {
		console.log('replay bench: building the app (vite build)…');
		run('npx', ['vite', 'build', '--logLevel', 'warn']);
		writeFileSync(stamp, new Date().toISOString());
	}
	const port = await freePort();
	const origin = `http://127.0.0.1:${port}`;
	server = spawn('node', ['scripts/serve.mjs'], {
		stdio: ['ignore', 'ignore', 'inherit'],
		env: { ...process.env, DATABASE_URL: databaseUrl, HOST: '127.0.0.1', PORT: String(port), ORIGIN: origin, SMTP_CATCHER_PORT: String(await freePort()), BODY_SIZE_LIMIT: '25M' }
	});
	for (let t = Date.now(); ; ) {
		try {
			if ((await fetch(`${origin}/api/health`)).ok) break;
		} catch {
			/* not up yet */
		}
		if (Date.now() - t > 120_000) throw new Error('the server did not come up in 2 minutes');
		await new Promise((r) => setTimeout(r, 250));
	}

	// 1. page data: size and time to serve, signed in
	const signIn = await fetch(`${origin}/api/v1/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(DEMO) });
	if (!signIn.ok) throw new Error(`demo sign-in: ${signIn.status}`);
	const cookie = signIn.headers
		.getSetCookie()
		.map((c) => c.split(';')[0])
		.join('; ');
	// the reference for serve times, measured in the same run: the health check (no session, no data)
	const healthTimes: number[] = [];
	for (let i = 0; i < 8; i++) {
		const t = performance.now();
		await (await fetch(`${origin}/api/health`)).arrayBuffer();
		if (i > 0) healthTimes.push(performance.now() - t);
	}
	const healthMs = median(healthTimes);
	console.log(`replay bench: reference: /api/health served in ${healthMs.toFixed(1)} ms (median of 7)`);
	let benchBytes = Infinity;
	let benchMs = Infinity;
	for (const s of studies) {
		const url = `${origin}/w/${ws.slug}/studies/${s.id}/__data.json`;
		const times: number[] = [];
		let bytes = 0;
		for (let i = 0; i < 8; i++) {
			const t = performance.now();
			const r = await fetch(url, { headers: { cookie } });
			const body = await r.arrayBuffer();
			if (!r.ok) throw new Error(`${url}: ${r.status}`);
			// the first request warms the route; the median is over the other 7
			if (i > 0) times.push(performance.now() - t);
			bytes = body.byteLength;
		}
		const ms = median(times);
		if (s.id === benchId) {
			benchBytes = bytes;
			benchMs = ms;
		}
		console.log(`replay bench: page data "${s.name}" (${s.runs_done.toLocaleString('en-US')} runs): ${(bytes / 1024).toFixed(0)} KiB, served in ${ms.toFixed(0)} ms = ${(ms / healthMs).toFixed(1)}× the health check (median of 7; paths not included)`);
	}

	// 2. playback in Chromium: 6 panels × 200-iteration paths
	const { chromium } = await import('playwright-core');
	const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: ['--no-sandbox', '--disable-gpu', '--disable-background-timer-throttling', '--disable-renderer-backgrounding'] });
	let fps = 0;
	let idleFps = 0;
	try {
		const context = await browser.newContext({ baseURL: origin, viewport: { width: 1440, height: 1000 } });
		await context.request.post('/api/v1/session', { data: DEMO });
		const page = await context.newPage();
		// the reference for the frame rate, measured in the same browser: an empty page's display frames over 2 s
		await page.goto('/api/health');
		idleFps = Number(
			await page.evaluate(`new Promise((resolve) => {
				let frames = 0;
				const t0 = performance.now();
				const tick = (now) => (++frames, now - t0 < 2000 ? requestAnimationFrame(tick) : resolve((frames / (now - t0)) * 1000));
				requestAnimationFrame(tick);
			})`)
		);
		console.log(`replay bench: reference: an empty page shows ${idleFps.toFixed(1)} frames/s in this browser`);
		// the 1,800-run study: from navigation to the first replay panel drawn, in the page's own clock
		await page.goto(`/w/${ws.slug}/studies/${benchId}`);
		await page.waitForSelector('[data-testid="replay-panel"] svg', { timeout: 60_000 });
		const firstPanelMs = Number(await page.evaluate('performance.now()'));
		console.log(`replay bench: 1,800-run study page: the replay's first panels drawn ${firstPanelMs.toFixed(0)} ms after navigation (page data, runs table and charts included)`);
		const LENGTH = 200;
		await page.route('**/api/v1/runs/*/path', async (route) => {
			const real = (await (await route.fetch()).json()) as { x: number[][]; f: (number | null)[]; grad: number[][] };
			const a = real.x[0][0];
			const b = real.x.at(-1)![0];
			// the real start and end, joined by a damped zig-zag of 200 iterates (f left out: the page evaluates the fit there)
			const xs = Array.from({ length: LENGTH }, (_, k) => {
				const t = k / (LENGTH - 1);
				return [b + (a - b) * (1 - t) * Math.cos(12 * Math.PI * t)];
			});
			await route.fulfill({
				json: { x: xs, f: xs.map(() => null), grad: xs.map(() => [null]), step: xs.map(() => null), violation: xs.map(() => 0) }
			});
		});
		const six = studies.find((s) => s.name === 'Propeller: peak efficiency') ?? studies[0];
		await page.goto(`/w/${ws.slug}/studies/${six.id}`);
		await page.waitForSelector('[data-testid="replay-panel"]', { timeout: 60_000 });
		const panels = await page.locator('[data-testid="replay-panel"]').count();
		for (const t of ['toggle-d1', 'toggle-d2']) if ((await page.getAttribute(`[data-testid="${t}"]`, 'aria-expanded')) !== 'true') await page.click(`[data-testid="${t}"]`);
		const last = await page.textContent('[data-testid="replay-frame"]');
		if (!last?.includes(`/ ${LENGTH - 1}`)) throw new Error(`the clock does not run to ${LENGTH - 1} iterations: ${last}`);
		await page.click('[data-testid="replay-loop"]');
		for (let i = 0; i < 3; i++) await page.click('button[aria-label="Faster (])"]');
		if ((await page.textContent('[data-testid="replay-speed"]')) !== '8×') throw new Error('the replay is not at 8×');
		await page.click('[data-testid="replay-play"]');
		// a string, not a function: tsx would wrap a function's inner names in a helper the page does not have
		const measured = (await page.evaluate(`new Promise((resolve) => {
			const counter = document.querySelector('[data-testid="replay-frame"]');
			const first = counter.textContent;
			let frames = 0, worst = 0, prev = 0;
			const t0 = performance.now();
			const tick = (now) => {
				if (prev) worst = Math.max(worst, now - prev);
				prev = now;
				frames++;
				if (now - t0 < 4000) requestAnimationFrame(tick);
				else resolve({ frames, ms: now - t0, first, lastFrame: counter.textContent, worst });
			};
			requestAnimationFrame(tick);
		})`)) as { frames: number; ms: number; first: string; lastFrame: string; worst: number };
		if (measured.first === measured.lastFrame) throw new Error('the replay did not move while it was measured');
		fps = (measured.frames / measured.ms) * 1000;
		console.log(
			`replay bench: playback of ${panels} panels × ${LENGTH}-iteration paths (+ f′, f″ and 2 convergence panels), 8×, loop: ${fps.toFixed(1)} frames/s = ${(fps / idleFps).toFixed(2)} of the empty page's rate, over ${(measured.ms / 1000).toFixed(1)} s, longest frame ${measured.worst.toFixed(0)} ms`
		);
	} finally {
		await browser.close();
	}

	const ok = fps >= TARGET_FPS && benchBytes <= PAGE_BYTES_LIMIT && benchMs <= PAGE_MS_LIMIT;
	console.log(
		`replay bench: ${ok ? 'PASS' : 'FAIL'} — target ≥ ${TARGET_FPS} frames/s (measured ${fps.toFixed(1)}); 1,800-run page data ≤ 1 MB (${(benchBytes / 1024).toFixed(0)} KiB) and ≤ ${PAGE_MS_LIMIT} ms to serve (${benchMs.toFixed(0)} ms)`
	);
	if (!ok) exitCode = 1;
} catch (e) {
	console.error(e);
	exitCode = 1;
} finally {
	if (server && server.exitCode === null) {
		// a graceful stop first; the server waits on its queue, so after 5 s it is killed
		const exited = new Promise((r) => server!.once('exit', r));
		server.kill('SIGTERM');
		const timer = setTimeout(() => server!.kill('SIGKILL'), 5000);
		await exited;
		clearTimeout(timer);
	}
	cluster.stop();
}
process.exit(exitCode);
