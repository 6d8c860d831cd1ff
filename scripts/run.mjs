#!/usr/bin/env node
// One entry point for `npm start`, `npm run dev`, `npm test` and `npm run worker`.
// Plain JavaScript on purpose: it runs before dependencies are installed.
import { spawn, spawnSync } from 'node:child_process';
import { allocatorEnv } from './allocator.mjs';
import { existsSync, statSync, readdirSync, mkdtempSync, rmSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
process.chdir(root);
const mode = process.argv[2] ?? 'start';
const log = (msg) => console.log(`kinkless: ${msg}`);
const children = new Set();
const cleanups = [];

// ---------------------------------------------------------------- dependencies
function newestMtime(paths) {
	let newest = 0;
	const walk = (p) => {
		if (!existsSync(p)) return;
		const s = statSync(p);
		if (s.isDirectory()) for (const e of readdirSync(p)) walk(path.join(p, e));
		else newest = Math.max(newest, s.mtimeMs);
	};
	for (const p of paths) walk(p);
	return newest;
}

function ensureDependencies() {
	const marker = 'node_modules/.package-lock.json';
	const stale = !existsSync(marker) || statSync('package-lock.json').mtimeMs > statSync(marker).mtimeMs + 1000;
	if (!stale) return;
	log('installing dependencies (npm ci)…');
	const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { stdio: 'inherit' });
	if (r.status !== 0) throw new Error('npm ci failed');
}

// ---------------------------------------------------------------- helpers
function freePort() {
	return new Promise((resolve, reject) => {
		const srv = createServer();
		srv.once('error', reject);
		srv.listen(0, '127.0.0.1', () => {
			const { port } = srv.address();
			srv.close(() => resolve(port));
		});
	});
}

function run(cmd, args, env = {}) {
	const r = spawnSync(cmd, args, { stdio: 'inherit', env: { ...process.env, ...env } });
	if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} exited with ${r.status ?? r.signal}`);
}

function startChild(cmd, args, env = {}, name = cmd) {
	// the server and the worker run with the allocator setting of scripts/allocator.mjs
	const child = spawn(cmd, args, { stdio: 'inherit', env: { ...process.env, ...allocatorEnv(process.env), ...env } });
	children.add(child);
	child.on('exit', (code, signal) => {
		children.delete(child);
		if (!shuttingDown && mode !== 'test') {
			log(`${name} exited (${code ?? signal}); stopping`);
			shutdown(code ?? 1);
		}
	});
	return child;
}

async function waitForHttp(url, timeoutMs = 60_000) {
	const t0 = Date.now();
	while (Date.now() - t0 < timeoutMs) {
		try {
			const r = await fetch(url);
			if (r.ok) return;
		} catch {
			/* not up yet */
		}
		await new Promise((r) => setTimeout(r, 250));
	}
	throw new Error(`server did not answer at ${url} within ${timeoutMs} ms`);
}

function buildIfStale() {
	const stamp = 'build/.kinkless-build-stamp';
	const sources = newestMtime(['src', 'static', 'svelte.config.js', 'vite.config.ts', 'tailwind.config.js', 'package-lock.json']);
	if (existsSync(stamp) && statSync(stamp).mtimeMs >= sources) return;
	log('building the app (vite build)…');
	run('npx', ['vite', 'build', '--logLevel', 'warn']);
	writeFileSync(stamp, new Date().toISOString());
}

let shuttingDown = false;
async function shutdown(code = 0) {
	if (shuttingDown) return;
	shuttingDown = true;
	for (const c of children) c.kill('SIGTERM');
	await new Promise((r) => setTimeout(r, children.size ? 500 : 0));
	for (const c of children) c.kill('SIGKILL');
	for (const fn of cleanups.reverse()) {
		try {
			await fn();
		} catch (e) {
			console.error(e);
		}
	}
	process.exit(code);
}
process.on('SIGINT', () => shutdown(130));
process.on('SIGTERM', () => shutdown(143));

// ---------------------------------------------------------------- database
async function database({ throwaway }) {
	if (process.env.DATABASE_URL && !throwaway) return process.env.DATABASE_URL;
	const { startCluster } = await import('./postgres.mjs');
	let dataDir;
	let port;
	if (throwaway) {
		dataDir = mkdtempSync(path.join(os.tmpdir(), 'kinkless-test-pg-'));
		rmSync(dataDir, { recursive: true });
		port = await freePort();
		cleanups.push(() => rmSync(dataDir, { recursive: true, force: true }));
	} else {
		dataDir = path.join(root, '.data', 'postgres');
		mkdirSync(path.dirname(dataDir), { recursive: true });
		port = Number(process.env.PGPORT ?? 54329);
	}
	const cluster = startCluster({ dataDir, port, log });
	cleanups.push(() => cluster.stop());
	return cluster.createDatabase(throwaway ? 'kinkless_test' : 'kinkless');
}

// ---------------------------------------------------------------- reference tools for the tests
function ensureReferenceTools() {
	const need = [];
	if (!existsSync('/usr/bin/chromium')) need.push('chromium');
	const py = existsSync('/usr/bin/python3') ? spawnSync('/usr/bin/python3', ['-c', 'import scipy']) : { status: 1 };
	if (py.status !== 0) need.push('python3-scipy');
	if (!need.length) return;
	const cmd = `apt-get update && apt-get install -y ${need.join(' ')}`;
	const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
	if (!isRoot) {
		console.error(`kinkless: the tests need Debian's ${need.join(' and ')} as reference tools. Install them with:\n  sudo ${cmd}`);
		process.exit(2);
	}
	log(`installing reference tools: ${cmd}`);
	run('sh', ['-c', `DEBIAN_FRONTEND=noninteractive ${cmd}`]);
}

// ---------------------------------------------------------------- modes
async function appEnv(databaseUrl, port, extra = {}) {
	const smtpPort = process.env.SMTP_CATCHER_PORT ?? String(await freePort());
	return {
		DATABASE_URL: databaseUrl,
		HOST: '127.0.0.1',
		PORT: String(port),
		ORIGIN: process.env.ORIGIN ?? `http://127.0.0.1:${port}`,
		SMTP_CATCHER_PORT: smtpPort,
		// started for local use: turns on the caught-mail viewer (only with the catcher, a loopback origin and NODE_ENV != production)
		KINKLESS_LOCAL: '1',
		...extra
	};
}

async function start(dev) {
	ensureDependencies();
	const databaseUrl = await database({ throwaway: false });
	run('npx', ['tsx', 'scripts/db.ts', 'migrate'], { DATABASE_URL: databaseUrl });
	run('npx', ['tsx', 'scripts/db.ts', 'seed'], { DATABASE_URL: databaseUrl });
	const port = Number(process.env.PORT ?? 3000);
	const env = await appEnv(databaseUrl, port);
	if (dev) {
		startChild('npx', ['vite', 'dev', '--host', '127.0.0.1', '--port', String(port), '--strictPort'], env, 'vite dev');
	} else {
		buildIfStale();
		startChild('node', ['scripts/serve.mjs'], { ...env, BODY_SIZE_LIMIT: '25M' }, 'server');
	}
	await waitForHttp(`http://127.0.0.1:${port}/api/health`, 120_000);
	log(`Kinkless is running at ${env.ORIGIN}`);
	log('demo sign-in: demo@larkmoor.example / larkmoor-demo-2026');
	if (!process.env.SMTP_URL) log('caught e-mail (local SMTP catcher, each user sees their own): ' + `${env.ORIGIN}/dev/mail`);
	log('press Ctrl-C to stop everything');
}

async function worker() {
	ensureDependencies();
	const databaseUrl = await database({ throwaway: false });
	startChild('npx', ['tsx', 'scripts/worker.ts'], { DATABASE_URL: databaseUrl }, 'worker');
}

function countResults(file) {
	if (!existsSync(file)) return { passed: 0, failed: 1, note: `${file} missing` };
	const j = JSON.parse(readFileSync(file, 'utf8'));
	return { passed: j.numPassedTests, failed: j.numFailedTests + (j.numRuntimeErrorTestSuites ?? 0), skipped: j.numPendingTests + j.numTodoTests };
}

async function test() {
	const t0 = Date.now();
	ensureDependencies();
	ensureReferenceTools();
	const databaseUrl = await database({ throwaway: true });
	run('npx', ['tsx', 'scripts/db.ts', 'migrate'], { DATABASE_URL: databaseUrl });
	run('npx', ['tsx', 'scripts/db.ts', 'seed'], { DATABASE_URL: databaseUrl });
	buildIfStale();
	const port = await freePort();
	const env = await appEnv(databaseUrl, port, { ORIGIN: `http://127.0.0.1:${port}`, KINKLESS_SIGNIN_LIMIT: '10', KINKLESS_SIGNIN_LIMIT_ADDRESS: '100000', KINKLESS_RESET_LIMIT_ADDRESS: '100000' });
	startChild('node', ['scripts/serve.mjs'], { ...env, BODY_SIZE_LIMIT: '25M' }, 'server');
	await waitForHttp(`http://127.0.0.1:${port}/api/health`);
	const testEnv = { ...env, KINKLESS_TEST_URL: env.ORIGIN };
	const results = path.join(root, '.data', 'test-results');
	mkdirSync(results, { recursive: true });
	const extra = process.argv.slice(3);
	const suites = [
		['unit+integration', ['--project', 'unit', '--project', 'integration']],
		['browser', ['--project', 'e2e']]
	];
	let passed = 0;
	let failed = 0;
	let skipped = 0;
	for (const [name, args] of suites) {
		const out = path.join(results, `${name}.json`);
		rmSync(out, { force: true });
		log(`running ${name} tests`);
		spawnSync('npx', ['vitest', 'run', ...args, '--reporter=default', '--reporter=json', `--outputFile.json=${out}`, ...extra], {
			stdio: 'inherit',
			env: { ...process.env, ...testEnv }
		});
		const c = countResults(out);
		passed += c.passed;
		failed += c.failed;
		skipped += c.skipped ?? 0;
	}
	log(`tests finished in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
	console.log(`kinkless: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
	await shutdown(failed > 0 || passed === 0 || skipped > 0 ? 1 : 0);
}

const modes = { start: () => start(false), dev: () => start(true), test, worker };
if (!modes[mode]) {
	console.error(`usage: node scripts/run.mjs start|dev|test|worker`);
	process.exit(2);
}
modes[mode]().catch(async (e) => {
	console.error(`kinkless: ${e.message}`);
	await shutdown(1);
});
