/**
 * Curve-fit benchmark: our builders and batch evaluation against SciPy, in one
 * run on the same data. `npm run bench:fits` (tsx tests/bench/fits.bench.ts).
 * Not a test: it prints a table and exits 0.
 *
 * For n = 1e3, 1e5, 1e6 knots (uneven, seeded) it times:
 *   build   — constructing the fit from x and y (ours: fitCurve, which checks
 *             finiteness, order and duplicates and copies x; SciPy: the class
 *             constructor with default arguments);
 *   random  — evaluating 1e6 points in random order;
 *   sorted  — evaluating the same 1e6 points sorted (our monotone cursor).
 * Ours computes f, f′ and f″ in one pass (evaluateMany), timed into fresh
 * output arrays (the default) and into reused ones (the `out` argument), and
 * values only (evaluateValues into a reused array); SciPy is timed computing
 * f only (a one-argument call, fresh output). The linear row compares build
 * with interp1d(x, y) and evaluation with np.interp (which has no build step).
 *
 * SciPy runs in one persistent Python process, and every repetition times
 * ours and SciPy's back to back, so both see the same machine load; each
 * figure is the median of those repetitions.
 *
 * Memory: doubles kept per knot by the stored representation; the search
 * index for random-order batches adds one 32-bit integer per piece once built.
 * A floor line times the cheapest pass over 1e6 points in each runtime (read
 * a double, write a double), for scale.
 *
 * BENCH_SIZES=1000,100000 runs fewer sizes; BENCH_REPS sets the repetitions (default 7).
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { fitCurve } from '../../src/lib/numerics/fits';
import type { CurveMethod } from '../../src/lib/numerics/fits';
import { PiecewisePolynomial } from '../../src/lib/numerics/fits/piecewisePolynomial';
import { mulberry32 } from '../../src/lib/numerics/math';

const PYTHON = '/usr/bin/python3';
const SIZES = (process.env.BENCH_SIZES ?? '1000,100000,1000000').split(',').map(Number);
const REPS = Number(process.env.BENCH_REPS ?? 7);
const POINTS = 1_000_000;
const METHODS: CurveMethod[] = ['linear', 'akima', 'pchip', 'cubic-natural'];

const WORKER = String.raw`
import json, sys, time
import numpy as np
from scipy.interpolate import interp1d, Akima1DInterpolator, PchipInterpolator, CubicSpline
import scipy
cfg = json.loads(sys.stdin.readline())
data = {}
for n in cfg['sizes']:
    d = cfg['dir'] + '/' + str(n)
    data[n] = {k: np.fromfile(d + '.' + k) for k in 'xyrs'}
makers = {
    'linear': lambda x, y: interp1d(x, y),
    'akima': lambda x, y: Akima1DInterpolator(x, y),
    'pchip': lambda x, y: PchipInterpolator(x, y),
    'cubic-natural': lambda x, y: CubicSpline(x, y, bc_type='natural'),
}
fits = {}
buf = np.empty(1000000)
print(json.dumps({'scipy': scipy.__version__, 'numpy': np.__version__}), flush=True)
for line in sys.stdin:
    c = json.loads(line)
    if c['op'] == 'quit':
        break
    if c['op'] == 'floor':
        s = data[cfg['sizes'][0]]['s']
        t0 = time.perf_counter(); np.multiply(s, 0.5, out=buf); ms = (time.perf_counter() - t0) * 1e3
        print(json.dumps({'ms': ms}), flush=True)
        continue
    n, m = c['n'], c['method']
    d = data[n]
    if c['op'] == 'build':
        inner = c['inner']
        t0 = time.perf_counter()
        for _ in range(inner):
            f = makers[m](d['x'], d['y'])
        ms = (time.perf_counter() - t0) * 1e3 / inner
        fits[(n, m)] = f
        per = 2.0 if m == 'linear' else (f.x.size + f.c.size) / n
        print(json.dumps({'ms': ms, 'perKnot': per}), flush=True)
    else:
        pts = d[c['set']]
        if m == 'linear':
            x, y = d['x'], d['y']
            t0 = time.perf_counter(); np.interp(pts, x, y); ms = (time.perf_counter() - t0) * 1e3
        else:
            f = fits[(n, m)]
            t0 = time.perf_counter(); f(pts); ms = (time.perf_counter() - t0) * 1e3
        print(json.dumps({'ms': ms}), flush=True)
`;

function median(v: number[]): number {
	const s = [...v].sort((a, b) => a - b);
	return s[Math.floor(s.length / 2)];
}

function makeData(n: number, seed: number) {
	const rnd = mulberry32(seed);
	const x = new Float64Array(n);
	const y = new Float64Array(n);
	let t = 0;
	for (let i = 0; i < n; i++) {
		t += 0.2 + rnd();
		x[i] = t;
		y[i] = Math.sin(t / 7) * 10 + Math.cos(t / 3) + 0.3 * rnd();
	}
	const random = new Float64Array(POINTS);
	for (let i = 0; i < POINTS; i++) random[i] = x[0] + (x[n - 1] - x[0]) * rnd();
	const sorted = Float64Array.from(random).sort();
	return { x, y, random, sorted };
}

/** A line-oriented JSON conversation with the Python worker. */
function startWorker(dir: string) {
	const child = spawn(PYTHON, ['-c', WORKER], { stdio: ['pipe', 'pipe', 'inherit'] });
	const lines = createInterface({ input: child.stdout });
	const waiting: ((v: string) => void)[] = [];
	lines.on('line', (l) => waiting.shift()?.(l));
	const next = () => new Promise<string>((resolve) => waiting.push(resolve));
	const ask = async (cmd: object): Promise<Record<string, number>> => {
		const reply = next();
		child.stdin.write(JSON.stringify(cmd) + '\n');
		return JSON.parse(await reply);
	};
	const hello = next();
	child.stdin.write(JSON.stringify({ sizes: SIZES, dir }) + '\n');
	return {
		hello: hello.then((l) => JSON.parse(l) as { scipy: string; numpy: string }),
		ask,
		stop: () => {
			child.stdin.write(JSON.stringify({ op: 'quit' }) + '\n');
			child.stdin.end();
		}
	};
}

function ms(fn: () => void, inner = 1): number {
	const t0 = performance.now();
	for (let i = 0; i < inner; i++) fn();
	return (performance.now() - t0) / inner;
}

interface Result {
	method: CurveMethod;
	n: number;
	ours: Record<'build' | 'random' | 'randomReused' | 'randomValues' | 'sorted' | 'sortedReused' | 'sortedValues', number>;
	scipy: Record<'build' | 'random' | 'sorted', number>;
	perKnot: number;
	indexPerKnot: number;
	scipyPerKnot: number;
}

async function main() {
	const dir = mkdtempSync(join(os.tmpdir(), 'kinkless-bench-'));
	const data = new Map<number, ReturnType<typeof makeData>>();
	for (const n of SIZES) {
		const d = makeData(n, 1000 + n);
		data.set(n, d);
		writeFileSync(join(dir, `${n}.x`), new Uint8Array(d.x.buffer));
		writeFileSync(join(dir, `${n}.y`), new Uint8Array(d.y.buffer));
		writeFileSync(join(dir, `${n}.r`), new Uint8Array(d.random.buffer));
		writeFileSync(join(dir, `${n}.s`), new Uint8Array(d.sorted.buffer));
	}
	const py = startWorker(dir);
	try {
		const versions = await py.hello;
		const results: Result[] = [];
		const out = { f: new Float64Array(POINTS), df: new Float64Array(POINTS), d2f: new Float64Array(POINTS) };
		for (const n of SIZES) {
			const d = data.get(n)!;
			for (const method of METHODS) {
				const inner = n <= 1000 ? 200 : 1;
				const t: Record<string, number[]> = {};
				const push = (k: string, v: number) => (t[k] ??= []).push(v);
				let fit = fitCurve(method, d.x, d.y) as PiecewisePolynomial;
				let scipyPerKnot = 0;
				// one untimed round to warm both up (JIT, caches), then REPS timed rounds
				for (let rep = -1; rep < REPS; rep++) {
					const keep = rep >= 0;
					const ob = ms(() => (fit = fitCurve(method, d.x, d.y) as PiecewisePolynomial), inner);
					const sb = await py.ask({ op: 'build', n, method, inner });
					scipyPerKnot = sb.perKnot;
					const oR = ms(() => fit.evaluateMany(d.random));
					const sR = (await py.ask({ op: 'eval', n, method, set: 'r' })).ms;
					const oRr = ms(() => fit.evaluateMany(d.random, out));
					const oRv = ms(() => fit.evaluateValues(d.random, out.f));
					const oS = ms(() => fit.evaluateMany(d.sorted));
					const sS = (await py.ask({ op: 'eval', n, method, set: 's' })).ms;
					const oSr = ms(() => fit.evaluateMany(d.sorted, out));
					const oSv = ms(() => fit.evaluateValues(d.sorted, out.f));
					if (!keep) continue;
					push('ob', ob);
					push('sb', sb.ms);
					push('oR', oR);
					push('sR', sR);
					push('oRr', oRr);
					push('oRv', oRv);
					push('oS', oS);
					push('sS', sS);
					push('oSr', oSr);
					push('oSv', oSv);
				}
				results.push({
					method,
					n,
					ours: {
						build: median(t.ob),
						random: median(t.oR),
						randomReused: median(t.oRr),
						randomValues: median(t.oRv),
						sorted: median(t.oS),
						sortedReused: median(t.oSr),
						sortedValues: median(t.oSv)
					},
					scipy: { build: median(t.sb), random: median(t.sR), sorted: median(t.sS) },
					// knots plus the coefficient buffer (cubics keep 4 spare doubles in it)
					perKnot: (fit.knots.length + fit.coefficients.buffer.byteLength / 8) / n,
					indexPerKnot: fit.searchIndexBytes / 8 / n,
					scipyPerKnot
				});
				process.stderr.write(`  ${method} n=${n} done\n`);
			}
		}
		const floorPy: number[] = [];
		const floorJs: number[] = [];
		const s0 = data.get(SIZES[0])!.sorted;
		for (let rep = 0; rep < 9; rep++) {
			floorPy.push((await py.ask({ op: 'floor' })).ms);
			floorJs.push(
				ms(() => {
					const f = out.f;
					for (let i = 0; i < s0.length; i++) f[i] = s0[i] * 0.5;
				})
			);
		}
		printTable(results, versions, median(floorJs), median(floorPy));
	} finally {
		py.stop();
		rmSync(dir, { recursive: true, force: true });
	}
}

function printTable(results: Result[], v: { scipy: string; numpy: string }, floorJs: number, floorPy: number) {
	const fmt = (x: number) => (x >= 100 ? x.toFixed(0) : x >= 10 ? x.toFixed(1) : x >= 1 ? x.toFixed(2) : x.toFixed(3));
	const ratio = (a: number, b: number) => (a / b).toFixed(2) + '×';
	console.log(
		`Kinkless curve fits vs SciPy ${v.scipy} (NumPy ${v.numpy}); Node ${process.version}; ${os.cpus().length} CPU(s), load average ${os.loadavg()[0].toFixed(1)}`
	);
	console.log(`Median of ${REPS} interleaved repetitions, ms; ratio = ours / SciPy; 1e6 evaluation points.`);
	console.log('ours: f, f′, f″ into fresh arrays ("fresh") | into reused arrays ("reused") | f only into a reused array ("f only"). SciPy: f only, fresh array.');
	console.log('linear: build vs interp1d(x, y), evaluation vs np.interp.\n');
	const head = ['method', 'n', 'build', 'SciPy', 'ratio', 'random fresh', 'reused', 'f only', 'SciPy', 'ratio fresh', 'reused', 'f only', 'sorted fresh', 'reused', 'f only', 'SciPy', 'ratio fresh', 'reused', 'f only', 'doubles/knot', 'SciPy'];
	const rows = results.map((r) => [
		r.method,
		r.n.toExponential(0),
		fmt(r.ours.build),
		fmt(r.scipy.build),
		ratio(r.ours.build, r.scipy.build),
		fmt(r.ours.random),
		fmt(r.ours.randomReused),
		fmt(r.ours.randomValues),
		fmt(r.scipy.random),
		ratio(r.ours.random, r.scipy.random),
		ratio(r.ours.randomReused, r.scipy.random),
		ratio(r.ours.randomValues, r.scipy.random),
		fmt(r.ours.sorted),
		fmt(r.ours.sortedReused),
		fmt(r.ours.sortedValues),
		fmt(r.scipy.sorted),
		ratio(r.ours.sorted, r.scipy.sorted),
		ratio(r.ours.sortedReused, r.scipy.sorted),
		ratio(r.ours.sortedValues, r.scipy.sorted),
		`${r.perKnot.toFixed(2)} (+${r.indexPerKnot.toFixed(2)})`,
		r.scipyPerKnot.toFixed(2)
	]);
	const widths = head.map((h, i) => Math.max(h.length, ...rows.map((row) => row[i].length)));
	const line = (cells: string[]) => '| ' + cells.map((c, i) => c.padStart(widths[i])).join(' | ') + ' |';
	console.log(line(head));
	console.log('|' + widths.map((w) => '-'.repeat(w + 2)).join('|') + '|');
	for (const r of rows) console.log(line(r));
	console.log(`\nFloor, read 1e6 doubles and write 1e6 into a reused array: JS ${fmt(floorJs)} ms, NumPy ${fmt(floorPy)} ms.`);
	console.log('doubles/knot: stored representation (+ the random-order search index, built on first need).');
	console.log('Targets: build and random ≤ 1.0×, sorted ≤ 0.2×, ≤ 5 doubles per knot for the cubics.');
}

main().catch((e) => {
	console.error(e);
	process.exit(1);
});
