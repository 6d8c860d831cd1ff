/**
 * Curve-fit benchmark: our builders and batch evaluation against SciPy, in one
 * run on the same data. `npm run bench:fits` (tsx tests/bench/fits.bench.ts).
 * Not a test: it prints a table and exits 0.
 *
 * For n = 1e3, 1e5, 1e6 knots (uneven, seeded) it times, as the median of a
 * few repetitions:
 *   build   — constructing the fit from x and y (ours: fitCurve, which checks
 *             finiteness, order and duplicates and copies x; SciPy: the class
 *             constructor with default arguments);
 *   random  — evaluating 1e6 points in random order;
 *   sorted  — evaluating the same 1e6 points sorted (our monotone cursor).
 * Ours computes f, f′ and f″ in one pass (evaluateMany), timed both into fresh
 * output arrays (the default) and into reused ones (the `out` argument), and
 * values only (evaluateValues, reused output); SciPy is timed computing f only
 * (a one-argument call, fresh output). The linear row compares evaluation with
 * np.interp (no build step) and build with interp1d.
 * Memory: doubles kept per knot (stored representation; the random-order
 * search index adds one 32-bit integer per piece once built).
 * A "floor" line times the cheapest possible pass over the same arrays in each
 * runtime (read 1e6 doubles, write 1e6 doubles), for scale.
 *
 * Environment knobs: BENCH_SIZES=1000,100000 to run fewer sizes.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os, { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fitCurve } from '../../src/lib/numerics/fits';
import type { CurveFit, CurveMethod } from '../../src/lib/numerics/fits';
import { PiecewisePolynomial } from '../../src/lib/numerics/fits/PiecewisePolynomial';
import { mulberry32 } from '../../src/lib/numerics/math';

const PYTHON = '/usr/bin/python3';
const SIZES = (process.env.BENCH_SIZES ?? '1000,100000,1000000').split(',').map(Number);
const POINTS = 1_000_000;
const METHODS: CurveMethod[] = ['linear', 'akima', 'pchip', 'cubic-natural'];

function median(v: number[]): number {
	const s = [...v].sort((a, b) => a - b);
	return s[Math.floor(s.length / 2)];
}

/** Median wall time (ms) of `reps` runs of `fn`, each run repeating it `inner` times. */
function time(fn: () => void, reps: number, inner = 1): number {
	fn(); // warm-up (JIT)
	const t: number[] = [];
	for (let r = 0; r < reps; r++) {
		const t0 = performance.now();
		for (let i = 0; i < inner; i++) fn();
		t.push((performance.now() - t0) / inner);
	}
	return median(t);
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

interface Row {
	method: CurveMethod;
	n: number;
	build: number;
	random: number;
	sorted: number;
	randomReused: number;
	sortedReused: number;
	randomValues: number;
	sortedValues: number;
	perKnot: number;
	indexPerKnot: number;
}

function benchOurs(method: CurveMethod, d: ReturnType<typeof makeData>): Row {
	const n = d.x.length;
	const inner = n <= 1000 ? 200 : 1;
	const reps = n >= 1_000_000 ? 5 : 9;
	let fit: CurveFit | null = null;
	const build = time(() => (fit = fitCurve(method, d.x, d.y)), reps, inner);
	const f = fit as unknown as PiecewisePolynomial;
	const random = time(() => f.evaluateMany(d.random), 5);
	const sorted = time(() => f.evaluateMany(d.sorted), 5);
	const out = { f: new Float64Array(POINTS), df: new Float64Array(POINTS), d2f: new Float64Array(POINTS) };
	const randomReused = time(() => f.evaluateMany(d.random, out), 5);
	const sortedReused = time(() => f.evaluateMany(d.sorted, out), 5);
	const randomValues = time(() => f.evaluateValues(d.random, out.f), 5);
	const sortedValues = time(() => f.evaluateValues(d.sorted, out.f), 5);
	// Stored doubles: the knots and the coefficient buffer (cubics keep 4 spare doubles in it).
	const perKnot = (f.knots.length + f.coefficients.buffer.byteLength / 8) / n;
	const indexPerKnot = (4 * (f.pieces + 1)) / 8 / n;
	return { method, n, build, random, sorted, randomReused, sortedReused, randomValues, sortedValues, perKnot, indexPerKnot };
}

/** The cheapest pass over 1e6 points in JS: read each, write one double. */
function jsFloor(xs: Float64Array): number {
	const out = new Float64Array(xs.length);
	return time(() => {
		for (let i = 0; i < xs.length; i++) out[i] = xs[i] * 0.5;
	}, 9);
}

const SCIPY = String.raw`
import json, sys, time
import numpy as np
from scipy.interpolate import interp1d, Akima1DInterpolator, PchipInterpolator, CubicSpline
cfg = json.loads(sys.stdin.read())
def med(fn, reps, inner=1):
    fn()
    ts = []
    for _ in range(reps):
        t0 = time.perf_counter()
        for _ in range(inner): fn()
        ts.append((time.perf_counter() - t0) / inner * 1e3)
    ts.sort()
    return ts[len(ts) // 2]
out = []
for n in cfg['sizes']:
    d = cfg['dir'] + '/' + str(n)
    x = np.fromfile(d + '.x'); y = np.fromfile(d + '.y'); r = np.fromfile(d + '.r'); s = np.fromfile(d + '.s')
    inner = 200 if n <= 1000 else 1
    reps = 5 if n >= 1000000 else 9
    makers = {
        'linear': lambda: interp1d(x, y),
        'akima': lambda: Akima1DInterpolator(x, y),
        'pchip': lambda: PchipInterpolator(x, y),
        'cubic-natural': lambda: CubicSpline(x, y, bc_type='natural'),
    }
    for m, mk in makers.items():
        build = med(mk, reps, inner)
        if m == 'linear':
            rnd = med(lambda: np.interp(r, x, y), 5)
            srt = med(lambda: np.interp(s, x, y), 5)
            f = mk()
            rnd1d = med(lambda: f(r), 5)
            per = 2.0
        else:
            f = mk()
            rnd = med(lambda: f(r), 5)
            srt = med(lambda: f(s), 5)
            rnd1d = None
            per = (f.x.size + f.c.size) / n
        out.append({'method': m, 'n': n, 'build': build, 'random': rnd, 'sorted': srt, 'interp1dRandom': rnd1d, 'perKnot': per})
s0 = np.fromfile(cfg['dir'] + '/' + str(cfg['sizes'][0]) + '.s')
buf = np.empty_like(s0)
floor = med(lambda: np.multiply(s0, 0.5, out=buf), 9)
floorFresh = med(lambda: s0 * 0.5, 9)
print(json.dumps({'rows': out, 'floor': floor, 'floorFresh': floorFresh}))
`;

function main() {
	const dir = mkdtempSync(join(tmpdir(), 'kinkless-bench-'));
	try {
		const data = new Map<number, ReturnType<typeof makeData>>();
		for (const n of SIZES) {
			const d = makeData(n, 1000 + n);
			data.set(n, d);
			writeFileSync(join(dir, `${n}.x`), new Uint8Array(d.x.buffer));
			writeFileSync(join(dir, `${n}.y`), new Uint8Array(d.y.buffer));
			writeFileSync(join(dir, `${n}.r`), new Uint8Array(d.random.buffer));
			writeFileSync(join(dir, `${n}.s`), new Uint8Array(d.sorted.buffer));
		}
		const ours: Row[] = [];
		for (const n of SIZES) for (const m of METHODS) ours.push(benchOurs(m, data.get(n)!));
		const py = spawnSync(PYTHON, ['-c', SCIPY], { input: JSON.stringify({ sizes: SIZES, dir }), encoding: 'utf8', maxBuffer: 1 << 24 });
		if (py.status !== 0) throw new Error(`SciPy timing failed: ${py.stderr}`);
		const parsed = JSON.parse(py.stdout) as { rows: (Row & { interp1dRandom: number | null })[]; floor: number; floorFresh: number };
		const ref = parsed.rows;
		const sv = spawnSync(PYTHON, ['-c', 'import scipy, numpy; print(scipy.__version__, numpy.__version__)'], { encoding: 'utf8' }).stdout.trim().split(' ');
		const floorJs = jsFloor(data.get(SIZES[0])!.sorted);

		const fmt = (v: number) => (v >= 100 ? v.toFixed(0) : v >= 10 ? v.toFixed(1) : v >= 1 ? v.toFixed(2) : v.toFixed(3));
		const ratio = (a: number, b: number) => (a / b).toFixed(2) + '×';
		console.log(`Kinkless curve fits vs SciPy ${sv[0]} (NumPy ${sv[1]}), Node ${process.version}, ${os.cpus().length} CPU(s), load average ${os.loadavg()[0].toFixed(1)}`);
		console.log('Median wall times in ms; ratio = ours / SciPy. 1e6 evaluation points.');
		console.log('ours: f, f′, f″ into fresh arrays | into reused arrays | f only (reused); SciPy: f only, fresh array.');
		console.log('Linear: build vs interp1d(x, y) defaults, evaluation vs np.interp.\n');
		const head = [
			'method',
			'n',
			'build ours',
			'SciPy',
			'ratio',
			'random ours',
			'reused',
			'f only',
			'SciPy',
			'ratio',
			'ratio reused',
			'sorted ours',
			'reused',
			'f only',
			'SciPy',
			'ratio',
			'ratio reused',
			'ratio f only',
			'doubles/knot ours',
			'SciPy'
		];
		const rows: string[][] = [];
		for (const o of ours) {
			const r = ref.find((q) => q.method === o.method && q.n === o.n)!;
			rows.push([
				o.method,
				o.n.toExponential(0),
				fmt(o.build),
				fmt(r.build),
				ratio(o.build, r.build),
				fmt(o.random),
				fmt(o.randomReused),
				fmt(o.randomValues),
				fmt(r.random),
				ratio(o.random, r.random),
				ratio(o.randomReused, r.random),
				fmt(o.sorted),
				fmt(o.sortedReused),
				fmt(o.sortedValues),
				fmt(r.sorted),
				ratio(o.sorted, r.sorted),
				ratio(o.sortedReused, r.sorted),
				ratio(o.sortedValues, r.sorted),
				`${o.perKnot.toFixed(2)} (+${o.indexPerKnot.toFixed(2)})`,
				r.perKnot.toFixed(2)
			]);
		}
		const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
		const line = (cells: string[]) => '| ' + cells.map((c, i) => c.padStart(widths[i])).join(' | ') + ' |';
		console.log(line(head));
		console.log('|' + widths.map((w) => '-'.repeat(w + 2)).join('|') + '|');
		for (const r of rows) console.log(line(r));
		const lin = ref.filter((q) => q.method === 'linear');
		console.log('\nFor reference, interp1d evaluation of the 1e6 random points: ' + lin.map((q) => `n=${q.n.toExponential(0)}: ${fmt(q.interp1dRandom!)} ms`).join(', '));
		console.log(
			`Floor (read 1e6 doubles, write 1e6): JS ${fmt(floorJs)} ms into a reused array; NumPy ${fmt(parsed.floor)} ms reused, ${fmt(parsed.floorFresh)} ms fresh.`
		);
		console.log('doubles/knot: stored representation (+ the random-order search index, built on first need).');
		console.log('Targets: build and random ≤ 1.0×, sorted ≤ 0.2×, ≤ 5 doubles per knot for the cubics.');
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
}

main();
