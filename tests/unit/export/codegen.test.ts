/**
 * Generated Python (run by Debian's python3 with NumPy) and generated
 * TypeScript (types stripped by esbuild, run by Node) agree with the engine's
 * own evaluation for every curve method and every extrapolation rule, at
 * 1,000 points: inside the data, exactly on every knot, and outside.
 * Reference: the engine itself (CurveFit.evaluate) — this checks that the
 * exported code is the same function; the methods are checked against SciPy
 * and published tables in tests/unit/fits. Tolerance 1e-12 (relative, floor 1,
 * tests/reference/tolerance.ts); the code repeats the engine's arithmetic,
 * so in practice the results are bit-identical, which is counted too.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { transformSync } from 'esbuild';
import { afterAll, describe, expect, it } from 'vitest';
import { CAUTION } from '../../../src/lib/caution';
import { curveMethods, fitCurve, type CurveFitOptions, type CurveMethod, type Extrapolation } from '../../../src/lib/numerics/fits';
import { createFitExport, generatePython, generateTypeScript } from '../../../src/lib/numerics/export';
import { PYTHON } from '../../reference/scipy';
import { expectClose } from '../../reference/tolerance';

const dir = mkdtempSync(join(tmpdir(), 'kinkless-codegen-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// A lift-curve-like table, invented: uneven spacing, a bend, a little noise.
const X = [-4, -2.5, -1, 0, 1.2, 2, 3.5, 5, 6, 7.5, 9, 10, 11.5, 13, 14, 15.5];
const Y = X.map((x, i) => 0.11 * x - 0.0009 * x ** 3 + 0.004 * Math.sin(3 * i));
const RULES: Extrapolation[] = ['refuse', 'hold', 'linear', 'extend'];

function optionsFor(method: CurveMethod): CurveFitOptions {
	if (method === 'cubic-clamped') return { slopes: [0.12, -0.5] };
	if (method === 'polynomial-least-squares') return { degree: 4 };
	return {};
}

/** 1,000 points: every knot (or node), 2 outside each side per rule, the rest inside (seeded). */
function points(knots: ArrayLike<number>, outside: boolean): number[] {
	const lo = X[0];
	const hi = X[X.length - 1];
	const pts = Array.from(knots);
	for (const x of X) pts.push(x);
	if (outside) pts.push(lo - 3, lo - 1e-9, hi + 1e-9, hi + 2.5, lo - 0.5, hi + 0.25);
	let s = 12345;
	while (pts.length < 1000) {
		s = (s * 1103515245 + 12345) % 2147483648;
		const u = s / 2147483648;
		pts.push(outside && pts.length % 10 === 0 ? lo - 2 + u * (hi - lo + 4) : lo + u * (hi - lo));
	}
	return pts;
}

async function exportDoc(method: CurveMethod, rule: Extrapolation) {
	const fit = fitCurve(method, X, Y, { ...optionsFor(method), extrapolation: rule });
	const doc = await createFitExport({
		fit: fit.toJSON(),
		source: { dataset: { name: 'Wing section A (invented)', version: 2, sha256: 'ab'.repeat(32) }, inputs: [{ name: 'alpha', unit: 'deg' }], output: { name: 'CL', unit: null } },
		kinkless: '0.1.0',
		caution: CAUTION
	});
	return { fit, doc };
}

type Answer = { f: number[]; g: number[]; h: number[]; single: [number, number, number]; error?: string };

describe('generated code agrees with the engine', () => {
	for (const method of Object.keys(curveMethods) as CurveMethod[]) {
		it(`${method}: Python and TypeScript, every extrapolation rule, 1,000 points`, async () => {
			const cases = [];
			for (const rule of RULES) {
				const { fit, doc } = await exportDoc(method, rule);
				const py = generatePython(doc);
				const ts = generateTypeScript(doc);
				for (const text of [py, ts]) {
					expect(text).toContain(CAUTION.slice(0, 40));
					expect(text).toContain(doc.checksum);
					expect(text).toContain(method);
				}
				const base = join(dir, `${method.replace(/-/g, '_')}_${rule}`);
				writeFileSync(`${base}.py`, py);
				writeFileSync(`${base}.mjs`, transformSync(ts, { loader: 'ts', format: 'esm' }).code);
				const pts = points(fit.knots, rule !== 'refuse');
				cases.push({ rule, fit, base, pts });
			}
			const job = cases.map((c) => ({ path: c.base, pts: c.pts, refuse: c.rule === 'refuse' }));
			const pyOut = runPython(job);
			const tsOut = runNode(job);
			let exact = 0;
			let total = 0;
			cases.forEach((c, k) => {
				for (const [lang, out] of [['python', pyOut[k]], ['typescript', tsOut[k]]] as const) {
					c.pts.forEach((x, i) => {
						const e = c.fit.evaluate(x);
						expectClose(out.f[i], e.f, 1e-12, `${lang} ${c.rule} f(${x})`);
						expectClose(out.g[i], e.df, 1e-12, `${lang} ${c.rule} f'(${x})`);
						expectClose(out.h[i], e.d2f, 1e-12, `${lang} ${c.rule} f''(${x})`);
						total += 3;
						exact += Number(Object.is(out.f[i], e.f)) + Number(Object.is(out.g[i], e.df)) + Number(Object.is(out.h[i], e.d2f));
					});
					const e0 = c.fit.evaluate(c.pts[0]);
					expect(out.single, `${lang} single-point form`).toEqual([e0.f, e0.df, e0.d2f]);
					if (c.rule === 'refuse') {
						// The refusal names the point and the domain.
						expect(out.error).toMatch(/alpha = -7(\.0)? lies outside the fit's domain \[-4(\.0)?, 15\.5\]/);
						expect(() => c.fit.evaluate(-7)).toThrow(/outside/);
					}
				}
			});
			expect(total).toBe(4 * 2 * 1000 * 3);
			// The generated code repeats the engine's arithmetic: nearly all results are bit-identical.
			expect(exact / total).toBeGreaterThan(0.99);
		});
	}
});

function runPython(job: { path: string; pts: number[]; refuse: boolean }[]): Answer[] {
	const code = `
import importlib.util, json, sys
job = json.loads(sys.stdin.read())
res = []
for c in job:
    spec = importlib.util.spec_from_file_location("fit", c["path"] + ".py")
    m = importlib.util.module_from_spec(spec); spec.loader.exec_module(m)
    f, g, h = m.evaluate(c["pts"])
    assert f.shape == (len(c["pts"]),) and g.shape == (len(c["pts"]), 1) and h.shape == (len(c["pts"]), 1, 1)
    sf, sg, sh = m.evaluate(c["pts"][0])
    r = {"f": f.tolist(), "g": g[:, 0].tolist(), "h": h[:, 0, 0].tolist(), "single": [sf, float(sg[0]), float(sh[0, 0])]}
    if c["refuse"]:
        try:
            m.evaluate([[1.0], [-7.0]])
        except ValueError as e:
            r["error"] = str(e)
    res.append(r)
print(json.dumps(res))
`;
	const r = spawnSync(PYTHON, ['-c', code], { input: JSON.stringify(job), encoding: 'utf8', maxBuffer: 64 << 20 });
	if (r.status !== 0) throw new Error(`python3 failed: ${r.stderr}`);
	return JSON.parse(r.stdout) as Answer[];
}

function runNode(job: { path: string; pts: number[]; refuse: boolean }[]): Answer[] {
	const code = `
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
const job = JSON.parse(readFileSync(0, 'utf8'));
const res = [];
for (const c of job) {
	const m = await import(pathToFileURL(c.path + '.mjs').href);
	const r = { f: [], g: [], h: [] };
	for (const x of c.pts) { const e = m.evaluate([x]); r.f.push(e.f); r.g.push(e.grad[0]); r.h.push(e.hess[0][0]); }
	const s = m.evaluate([c.pts[0]]);
	r.single = [s.f, s.grad[0], s.hess[0][0]];
	if (c.refuse) { try { m.evaluate([-7]); } catch (e) { r.error = e.message; } }
	res.push(r);
}
process.stdout.write(JSON.stringify(res));
`;
	const r = spawnSync(process.execPath, ['--input-type=module', '-e', code], { input: JSON.stringify(job), encoding: 'utf8', maxBuffer: 64 << 20 });
	if (r.status !== 0) throw new Error(`node failed: ${r.stderr}`);
	return JSON.parse(r.stdout) as Answer[];
}
