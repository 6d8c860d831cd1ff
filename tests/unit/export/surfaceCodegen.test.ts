/**
 * Generated Python (Debian's python3 with NumPy) and generated TypeScript
 * (types stripped by esbuild, run by Node) for surface fits agree with the
 * engine's own evaluation (SurfaceFit.evaluate) at 1,000 points per fit:
 * inside the data, exactly on grid lines (grid fits) or at the data points
 * (RBF), and outside the box under 'extend' (the only rule besides 'refuse'
 * that surface fits support; under 'refuse' the generated code refuses and
 * names the input and the domain). Reference: the engine itself — this checks
 * the exported code is the same function; the methods are checked against
 * SciPy in tests/unit/surfaces. Tolerance 1e-12 relative (floor 1,
 * tests/reference/tolerance.ts) for f, every gradient entry and every Hessian
 * entry; the code repeats the engine's arithmetic, so nearly all results are
 * bit-identical, which is counted too. For RBF fits NumPy's exp/log/sqrt may
 * differ from V8's in the last bit; each kernel term then moves by about one
 * ulp of |c_j g_j|, and the sum by a few ulps of Σ|c_j g_j| — at the condition
 * numbers here (up to ~1e8) the measured worst is ~1e-13, inside 1e-12, so no
 * looser tolerance is needed (the worst difference and κ are printed).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { transformSync } from 'esbuild';
import { afterAll, describe, expect, it } from 'vitest';
import { CAUTION } from '../../../src/lib/caution';
import { fitGrid, fitScatter, gridMethods, surfaceFromJSON } from '../../../src/lib/numerics/fits';
import type { GridMethod, ScatterMethod, SurfaceExtrapolation, SurfaceFit, SurfaceFitOptions } from '../../../src/lib/numerics/fits';
import { createFitExport, generatePython, generateTypeScript, loadFitExport } from '../../../src/lib/numerics/export';
import { PYTHON } from '../../reference/scipy';
import { expectClose } from '../../reference/tolerance';
import { rng, tabulate, unevenAxis } from '../surfaces/helpers';

const dir = mkdtempSync(join(tmpdir(), 'kinkless-surface-codegen-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const NAMES = ['mach', 'alpha', 'height'];
const UNITS = ['', 'deg', 'km'];

async function exportDoc(fit: SurfaceFit) {
	return createFitExport({
		fit: fit.toJSON(),
		source: {
			dataset: { name: 'Engine map B (invented)', version: 4, sha256: 'cd'.repeat(32) },
			inputs: NAMES.slice(0, fit.dimension).map((name, k) => ({ name, unit: UNITS[k] || null })),
			output: { name: 'thrust', unit: 'kN' }
		},
		kinkless: '0.1.0',
		caution: CAUTION
	});
}

interface Case {
	label: string;
	fit: SurfaceFit;
	base: string;
	pts: number[][];
	refuse: number[] | null;
}

type Answer = { f: number[]; g: number[][]; h: number[][]; single: number[]; error?: string };

async function prepare(label: string, fit: SurfaceFit, pts: number[][], refuse: number[] | null): Promise<Case> {
	const doc = await exportDoc(fit);
	// the fit read back from the exported document is the same fit (the exporter's reader)
	const { fit: back } = await loadFitExport(doc, surfaceFromJSON);
	expect(back.value(pts[0])).toBe(fit.value(pts[0]));
	const py = generatePython(doc);
	const ts = generateTypeScript(doc);
	for (const text of [py, ts]) {
		expect(text).toContain(CAUTION.slice(0, 40));
		expect(text).toContain(doc.checksum);
		expect(text).toContain(fit.method);
		for (let k = 0; k < fit.dimension; k++) expect(text).toContain(`Domain:        ${NAMES[k]} in [${fit.domain[k][0]}, ${fit.domain[k][1]}]`);
	}
	const base = join(dir, label.replace(/[^a-z0-9]+/gi, '_'));
	writeFileSync(`${base}.py`, py);
	writeFileSync(`${base}.mjs`, transformSync(ts, { loader: 'ts', format: 'esm' }).code);
	return { label, fit, base, pts, refuse };
}

function check(cases: Case[]): { exact: number; total: number; worst: number } {
	const job = cases.map((c) => ({ path: c.base, pts: c.pts, refuse: c.refuse }));
	const pyOut = runPython(job);
	const tsOut = runNode(job);
	let exact = 0;
	let total = 0;
	let worst = 0;
	cases.forEach((c, ci) => {
		const d = c.fit.dimension;
		for (const [lang, out] of [['python', pyOut[ci]], ['typescript', tsOut[ci]]] as const) {
			c.pts.forEach((x, i) => {
				const e = c.fit.evaluate(x);
				const pairs: [number, number, string][] = [[out.f[i], e.f, 'f']];
				for (let k = 0; k < d; k++) pairs.push([out.g[i][k], e.grad[k], `df/dx${k}`]);
				for (let k = 0; k < d * d; k++) pairs.push([out.h[i][k], e.hess[k], `d2f[${k}]`]);
				for (const [a, b, what] of pairs) {
					expectClose(a, b, 1e-12, `${lang} ${c.label} ${what} at (${x})`);
					worst = Math.max(worst, Math.abs(a - b) / Math.max(1, Math.abs(b)));
					total += 1;
					exact += Number(a === b);
				}
			});
			const e0 = c.fit.evaluate(c.pts[0]);
			expect(out.single.length, `${lang} single-point form`).toBe(1 + d);
			[e0.f, ...e0.grad].forEach((v, k) => expectClose(out.single[k], v, 1e-12, `${lang} ${c.label} single-point form [${k}]`));
			if (c.refuse) {
				expect(out.error, `${lang} refusal`).toMatch(new RegExp(`${NAMES[0]} = ${c.refuse[0]}(\\.0)? lies outside the fit's domain \\[`));
				expect(() => c.fit.evaluate(c.refuse as number[])).toThrow(/outside/);
			}
		}
	});
	return { exact, total, worst };
}

describe('generated code for grid fits agrees with the engine', () => {
	for (const d of [2, 3]) {
		const axes = Array.from({ length: d }, (_, k) => unevenAxis(6 - k, -1 - k, 2 + 0.5 * k, 20 + k));
		const values = tabulate(axes, (x) => Math.sin(1.3 * x[0]) * Math.exp(0.4 * x[1]) + 0.2 * x[0] * x[1] + (d > 2 ? 0.3 * x[2] * x[2] - x[2] * x[0] : 0));
		for (const method of Object.keys(gridMethods) as GridMethod[]) {
			it(`${method}, ${d} inputs: Python and TypeScript, refuse and extend, 1,000 points`, async () => {
				const cases: Case[] = [];
				for (const rule of ['refuse', 'extend'] as SurfaceExtrapolation[]) {
					const fit = fitGrid(method, axes, values, { extrapolation: rule });
					const r = rng(d * 100 + rule.length);
					const pts: number[][] = [];
					// every grid node, then one input on a grid line and the rest random, then random (outside under extend)
					const nodes = tabulate(axes, (x) => pts.push(x.slice()));
					expect(nodes.length).toBe(axes.reduce((p, a) => p * a.length, 1));
					const span = axes.map((a) => a[a.length - 1] - a[0]);
					let q = 0;
					while (pts.length < 1000) {
						const p = axes.map((a, k) => a[0] + span[k] * r());
						if (q % 3 === 0) {
							const k = q % d;
							p[k] = axes[k][1 + (q % (axes[k].length - 2))];
						} else if (rule === 'extend' && q % 5 === 1) {
							const k = q % d;
							p[k] = r() < 0.5 ? axes[k][0] - 0.3 * span[k] * r() : axes[k][axes[k].length - 1] + 0.3 * span[k] * r();
						}
						pts.push(p);
						q += 1;
					}
					const refuse = rule === 'refuse' ? [axes[0][0] - 1.5, ...axes.slice(1).map((a) => a[0])] : null;
					cases.push(await prepare(`${method}-${d}-${rule}`, fit, pts, refuse));
				}
				const { exact, total } = check(cases);
				expect(total).toBe(2 * 2 * 1000 * (1 + d + d * d));
				expect(exact / total).toBeGreaterThan(0.99);
			});
		}
	}
});

describe('generated code for RBF fits agrees with the engine', () => {
	const r = rng(99);
	const x = Array.from({ length: 40 }, () => [0.3 + 0.6 * r(), -4 + 12 * r(), 11 * r()]);
	const y = x.map(([a, b, c]) => Math.cos(3 * a) + 0.05 * b * b - 0.1 * c + 0.02 * b * c);
	const lo = [0.3, -4, 0];
	const span = [0.6, 12, 11];
	const setups: [ScatterMethod, SurfaceFitOptions][] = [
		['rbf-thin-plate', {}],
		['rbf-thin-plate', { degree: 0, smoothing: 1e-2 }],
		['rbf-multiquadric', { epsilon: 2 }],
		['rbf-multiquadric', { epsilon: 1, degree: -1 }],
		['rbf-gaussian', { epsilon: 3 }],
		['rbf-gaussian', { epsilon: 2, smoothing: 1e-3, degree: 0 }]
	];
	for (const [method, options] of setups) {
		it(`${method} ${JSON.stringify(options)}: Python and TypeScript, 1,000 points inside, at the data and outside`, async () => {
			const fit = fitScatter(method, x, y, options);
			const pts: number[][] = x.map((p) => p.slice());
			while (pts.length < 1000) pts.push(lo.map((l, k) => l - 0.25 * span[k] + 1.5 * span[k] * r()));
			expect(pts.some((p) => p.some((v, k) => v < fit.domain[k][0] || v > fit.domain[k][1]))).toBe(true);
			const { exact, total, worst } = check([await prepare(`${method}-${JSON.stringify(options)}`, fit, pts, null)]);
			expect(total).toBe(2 * 1000 * (1 + 3 + 9));
			// TypeScript runs the engine's own Math.exp/log/sqrt: bit-identical there; NumPy's may differ in the last bit
			expect(exact / total).toBeGreaterThan(0.5);
			console.info(`${method} ${JSON.stringify(options)}: condition ${fit.stats.condition?.toExponential(2)}, worst relative difference ${worst.toExponential(2)}, ${exact}/${total} bit-identical`);
		});
	}
});

function runPython(job: { path: string; pts: number[][]; refuse: number[] | null }[]): Answer[] {
	const code = `
import importlib.util, json, sys
job = json.loads(sys.stdin.read())
res = []
for c in job:
    spec = importlib.util.spec_from_file_location("fit", c["path"] + ".py")
    m = importlib.util.module_from_spec(spec); spec.loader.exec_module(m)
    n, d = len(c["pts"]), len(c["pts"][0])
    f, g, h = m.evaluate(c["pts"])
    assert f.shape == (n,) and g.shape == (n, d) and h.shape == (n, d, d)
    sf, sg, sh = m.evaluate(c["pts"][0])
    assert sg.shape == (d,) and sh.shape == (d, d)
    r = {"f": f.tolist(), "g": g.tolist(), "h": h.reshape(n, d * d).tolist(), "single": [sf] + sg.tolist()}
    if c["refuse"] is not None:
        try:
            m.evaluate([c["pts"][0], c["refuse"]])
        except ValueError as e:
            r["error"] = str(e)
    res.append(r)
print(json.dumps(res))
`;
	const r = spawnSync(PYTHON, ['-c', code], { input: JSON.stringify(job), encoding: 'utf8', maxBuffer: 256 << 20 });
	if (r.status !== 0) throw new Error(`python3 failed: ${r.stderr}`);
	return JSON.parse(r.stdout) as Answer[];
}

function runNode(job: { path: string; pts: number[][]; refuse: number[] | null }[]): Answer[] {
	const code = `
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
const job = JSON.parse(readFileSync(0, 'utf8'));
const res = [];
for (const c of job) {
	const m = await import(pathToFileURL(c.path + '.mjs').href);
	const r = { f: [], g: [], h: [] };
	for (const x of c.pts) { const e = m.evaluate(x); r.f.push(e.f); r.g.push(e.grad); r.h.push(e.hess.flat()); }
	const s = m.evaluate(c.pts[0]);
	r.single = [s.f, ...s.grad];
	if (c.refuse) { try { m.evaluate(c.refuse); } catch (e) { r.error = e.message; } }
	res.push(r);
}
process.stdout.write(JSON.stringify(res));
`;
	const r = spawnSync(process.execPath, ['--input-type=module', '-e', code], { input: JSON.stringify(job), encoding: 'utf8', maxBuffer: 256 << 20 });
	if (r.status !== 0) throw new Error(`node failed: ${r.stderr}`);
	return JSON.parse(r.stdout) as Answer[];
}
