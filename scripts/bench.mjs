#!/usr/bin/env node
/**
 * Runs benchmark files (tests/bench/<name>.bench.ts) one after another, each in
 * its own tsx process, with the same glibc allocator setting as the server
 * (scripts/allocator.mjs: transparent huge pages for malloc'd memory). The
 * SciPy side of a bench runs with glibc's defaults (tests/reference/scipy.ts
 * drops the setting: it measured slower for SciPy). BENCH_MALLOC=default runs with glibc's
 * defaults instead (to measure what the setting is worth). Node runs with
 * --expose-gc so that a bench can collect its warm-up's garbage before timing.
 *
 *   node scripts/bench.mjs fits surfaces uploads
 */
import { spawnSync } from 'node:child_process';
import { allocatorEnv } from './allocator.mjs';

const names = process.argv.slice(2);
if (names.length === 0) {
	console.error('usage: node scripts/bench.mjs <name> … (tests/bench/<name>.bench.ts)');
	process.exit(2);
}
const base = { ...process.env, NODE_OPTIONS: `${process.env.NODE_OPTIONS ?? ''} --expose-gc`.trim() };
const env = process.env.BENCH_MALLOC === 'default' ? base : { ...base, ...allocatorEnv(process.env) };
console.log(`allocator: ${env.GLIBC_TUNABLES ? `GLIBC_TUNABLES=${env.GLIBC_TUNABLES}` : "glibc's defaults"}`);
for (const name of names) {
	const r = spawnSync('npx', ['tsx', `tests/bench/${name}.bench.ts`], { stdio: 'inherit', env });
	if (r.status !== 0) process.exit(r.status ?? 1);
}
