// Studies over 2 and 3 inputs through the real API, server, job queue and
// PostgreSQL: bounds per input, a constraint on another output, grid and
// Latin-hypercube starts, SQP, BFGS and Newton on grid and scattered fits.
// Every `converged` run is confirmed independently: the fit is read back
// through the fit export (and the constraint's fit rebuilt here from the same
// table), and the KKT conditions are measured at the run's end point
// (./surfaceKkt.ts). Optima are compared with SciPy's SLSQP run live on the
// exact functions the tables were tabulated from (the not-a-knot tensor
// spline reproduces them, so it must land on the same point).
// All tables are INVENTED, tabulated from the stated functions.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadFitExport } from '../../src/lib/numerics/export';
import { fitGrid } from '../../src/lib/numerics/fits/fitGrid';
import { surfaceFromJSON } from '../../src/lib/numerics/fits/surfaceFile';
import type { GridMethod, SurfaceFit } from '../../src/lib/numerics/fits/surfaceTypes';
import { runScipy } from '../reference/scipy';
import { json, testDb } from './client';
import { dataset, launch, team, waitFor, type RunBody, type StudyBody } from './studiesFixtures';
import { gradF, gridRows, halton, kkt, type KktConstraint } from './surfaceKkt';

afterAll(async () => {
	await testDb().destroy();
});

// ---- the tables
// A motor-like efficiency map over torque × speed (uneven axes) with a power
// output P = 0.1·T·w: eta is quadratic, so the not-a-knot tensor spline is exact.
const T_AXIS = [0, 1, 2.5, 4, 5, 6.5, 8, 10];
const W_AXIS = [0, 1, 2, 3.5, 5, 6];
const eta = ([T, w]: number[]) => 0.95 - 0.004 * (T - 6) ** 2 - 0.006 * (w - 4) ** 2 + 0.001 * (T - 6) * (w - 4);
const power = ([T, w]: number[]) => 0.1 * T * w;
const MAP = {
	name: 'Map over torque × speed (invented)',
	columns: [
		{ name: 'T', unit: 'N·m', role: 'input' },
		{ name: 'w', unit: 'krpm', role: 'input' },
		{ name: 'eta', unit: '-', role: 'output' },
		{ name: 'P', unit: 'kW', role: 'output' }
	],
	rows: gridRows([T_AXIS, W_AXIS], [eta, power])
};
// Three inputs: a quadratic bowl g and a sum h, on an uneven 5 × 4 × 4 grid.
const X3 = [
	[0, 0.5, 1.5, 2.5, 4],
	[0, 1, 2, 3],
	[0, 0.6, 1.2, 2]
];
const bowl = ([x, y, z]: number[]) => (x - 1.3) ** 2 + 0.5 * (y - 2.2) ** 2 + 2 * (z - 0.7) ** 2 + 0.3 * x * y - 0.1 * y * z;
const sum3 = ([x, y, z]: number[]) => x + y + z;
const CUBE = {
	name: 'Bowl over three inputs (invented)',
	columns: [
		{ name: 'x', role: 'input' },
		{ name: 'y', role: 'input' },
		{ name: 'z', role: 'input' },
		{ name: 'g', role: 'output' },
		{ name: 'h', role: 'output' }
	],
	rows: gridRows(X3, [bowl, sum3])
};
// Scattered: 40 Halton points over [0, 2]² of a smooth bowl.
const scatterF = ([x, y]: number[]) => (x - 1.1) ** 2 + (y - 0.8) ** 2 + 0.2 * x * y;
const SCATTER = {
	name: 'Scattered bowl (invented)',
	columns: [
		{ name: 'a', role: 'input' },
		{ name: 'b', role: 'input' },
		{ name: 'q', role: 'output' }
	],
	rows: halton(40, [
		[0, 2],
		[0, 2]
	]).map((p) => [...p, scatterF(p)])
};

let t: Awaited<ReturnType<typeof team>>;
const ids: Record<string, string> = {};

type Study = { body: StudyBody; runs: RunBody[]; fits: Map<string, SurfaceFit> };

async function finished(id: string): Promise<Study> {
	const c = t.viewer.client;
	const body = await waitFor(c, id, undefined, 180_000);
	const runs = (await json<{ runs: RunBody[] }>(await c.get(`/api/v1/studies/${id}/runs`))).runs;
	const fits = new Map<string, SurfaceFit>();
	for (const f of body.fits) {
		const r = await c.get(`/api/v1/studies/${id}/fits/${f.id}/export?format=json`);
		expect(r.status, `export of ${f.method}`).toBe(200);
		const { doc, fit } = await loadFitExport(await r.text(), surfaceFromJSON);
		expect(doc.source.inputs.length, 'the export names every input').toBe(fit.dimension);
		fits.set(f.id, fit);
	}
	return { body, runs, fits };
}

/** The constraint output's fit, rebuilt here from the test's own table with the same method. */
function rebuilt(method: string, axes: number[][], f: (x: number[]) => number): SurfaceFit {
	const rows = gridRows(axes, [f]);
	return fitGrid(method as GridMethod, axes, Float64Array.from(rows, (r) => r[axes.length]));
}

/**
 * Every converged run passes the KKT test measured here; stationarity is held
 * to 1e-6 × max(1, ‖∇F(start)‖∞), a hundred times looser than the optimizer's
 * own 1e-8 but far below what a stalled or wandering run shows.
 */
function checkConverged(s: Study, kind: 'minimize' | 'maximize', bounds: [number, number][], cons: (method: string) => KktConstraint[]): number {
	let checked = 0;
	for (const r of s.runs) {
		expect(r.x.length).toBe(bounds.length);
		r.x.forEach((v, k) => {
			expect(v).toBeGreaterThanOrEqual(bounds[k][0] - 1e-12);
			expect(v).toBeLessThanOrEqual(bounds[k][1] + 1e-12);
		});
		if (r.outcome !== 'converged') continue;
		const fit = s.fits.get(r.fitId)!;
		// the stored f* is the fit's value at x* (the user's f, not −f)
		expect(r.f!).toBeCloseTo(fit.value(r.x), 12);
		const scale = Math.max(1, ...gradF(fit, r.start, kind).map(Math.abs));
		const k = kkt(fit, kind, bounds, cons(r.method), r.x);
		const what = `${r.method}/${r.optimizer} from (${r.start.join(', ')}) → (${r.x.join(', ')})`;
		expect(k.stationarity, `${what}: stationarity`).toBeLessThanOrEqual(1e-6 * scale);
		expect(k.violation, `${what}: feasibility`).toBeLessThanOrEqual(1e-6);
		expect(k.wrongSign, `${what}: multiplier signs`).toBeGreaterThanOrEqual(-1e-6 * scale);
		checked++;
	}
	return checked;
}

/** A run that stopped "at a kink" must end on a grid line of the fit (some input equal to an axis value). */
function checkAtKink(s: Study, axes: number[][]): number {
	const kinked = s.runs.filter((r) => r.atKink);
	for (const r of kinked) {
		const onLine = r.x.some((v, k) => axes[k].some((a) => Math.abs(a - v) <= 1e-6 * (axes[k].at(-1)! - axes[k][0])));
		expect(onLine, `${r.method}/${r.optimizer} at (${r.x.join(', ')}) flagged at a kink`).toBe(true);
	}
	return kinked.length;
}

const SMOOTH_GRID = ['grid-cubic-not-a-knot', 'grid-cubic-natural', 'grid-pchip'];

// SciPy's SLSQP on the exact functions (live reference): the constrained optimum of the map,
// the unconstrained one, and the bounded / constrained bowl minima in 3-D.
const ref = runScipy<{ mapC: number[]; mapU: number[]; cubeB: number[]; cubeC: number[]; scat: number[] }>(
	`from scipy.optimize import minimize
eta = lambda z: 0.95 - 0.004*(z[0]-6)**2 - 0.006*(z[1]-4)**2 + 0.001*(z[0]-6)*(z[1]-4)
bowl = lambda z: (z[0]-1.3)**2 + 0.5*(z[1]-2.2)**2 + 2*(z[2]-0.7)**2 + 0.3*z[0]*z[1] - 0.1*z[1]*z[2]
o = {'ftol': 1e-14, 'maxiter': 500}
mapC = minimize(lambda z: -eta(z), [8, 5], method='SLSQP', bounds=[(1, 9), (1, 5.5)], constraints=[{'type': 'ineq', 'fun': lambda z: 0.1*z[0]*z[1] - 3}], options=o).x
mapU = minimize(lambda z: -eta(z), [2, 2], method='SLSQP', bounds=[(1, 9), (1, 5.5)], options=o).x
cubeB = minimize(bowl, [2, 1, 1.5], method='SLSQP', bounds=[(0, 4), (0, 3), (1, 2)], options=o).x
cubeC = minimize(bowl, [0.5, 0.5, 0.5], method='SLSQP', bounds=[(0, 4), (0, 3), (0, 2)], constraints=[{'type': 'ineq', 'fun': lambda z: 2.5 - z[0] - z[1] - z[2]}], options=o).x
scat = minimize(lambda z: (z[0]-1.1)**2 + (z[1]-0.8)**2 + 0.2*z[0]*z[1], [1, 1], method='SLSQP', bounds=[(0.2, 1.8), (0.2, 1.8)], options=o).x
out = {'mapC': mapC, 'mapU': mapU, 'cubeB': cubeB, 'cubeC': cubeC, 'scat': scat}`
);

const MAP_BOUNDS: [number, number][] = [
	[1, 9],
	[1, 5.5]
];
const CUBE_BOUNDS: [number, number][] = [
	[0, 4],
	[0, 3],
	[1, 2]
];
const SCAT_BOUNDS: [number, number][] = [
	[0.2, 1.8],
	[0.2, 1.8]
];

const studies: Record<string, Study> = {};

beforeAll(async () => {
	t = await team('surf');
	const c = t.editor.client;
	ids.map = await dataset(c, t.ws.slug, MAP);
	ids.cube = await dataset(c, t.ws.slug, CUBE);
	ids.scatter = await dataset(c, t.ws.slug, SCATTER);
	const launched = {
		mapC: await launch(c, t.ws.slug, {
			name: 'Map: max eta with P ≥ 3',
			datasetId: ids.map,
			output: 'eta',
			problem: { kind: 'maximize', bounds: MAP_BOUNDS, constraints: [{ output: 'P', op: '>=', value: 3 }] },
			fits: [{ method: 'grid-linear' }, ...SMOOTH_GRID.map((method) => ({ method }))],
			optimizers: [{ method: 'sqp' }],
			starts: { grid: 3 }
		}),
		mapU: await launch(c, t.ws.slug, {
			name: 'Map: max eta',
			datasetId: ids.map,
			output: 'eta',
			problem: { kind: 'maximize', bounds: MAP_BOUNDS },
			fits: [{ method: 'grid-linear' }, ...SMOOTH_GRID.map((method) => ({ method }))],
			optimizers: [{ method: 'bfgs' }, { method: 'newton' }],
			starts: { latinHypercube: 8, seed: 5 }
		}),
		cubeB: await launch(c, t.ws.slug, {
			name: 'Bowl: min g, z ≥ 1',
			datasetId: ids.cube,
			output: 'g',
			problem: { kind: 'minimize', bounds: CUBE_BOUNDS },
			fits: [{ method: 'grid-linear' }, { method: 'grid-cubic-not-a-knot' }, { method: 'grid-akima' }],
			optimizers: [{ method: 'bfgs' }, { method: 'newton' }],
			starts: { latinHypercube: 6, seed: 11 }
		}),
		cubeC: await launch(c, t.ws.slug, {
			name: 'Bowl: min g with h ≤ 2.5',
			datasetId: ids.cube,
			output: 'g',
			problem: { kind: 'minimize', constraints: [{ output: 'h', op: '<=', value: 2.5 }] },
			fits: [{ method: 'grid-cubic-not-a-knot' }, { method: 'grid-cubic-natural' }],
			optimizers: [{ method: 'sqp' }],
			starts: { grid: 2 }
		}),
		scat: await launch(c, t.ws.slug, {
			name: 'Scatter: min q',
			datasetId: ids.scatter,
			output: 'q',
			problem: { kind: 'minimize', bounds: SCAT_BOUNDS },
			fits: [{ method: 'rbf-thin-plate' }, { method: 'rbf-gaussian', options: { epsilon: 3 } }],
			optimizers: [{ method: 'bfgs' }, { method: 'sqp' }],
			starts: { latinHypercube: 6, seed: 2 }
		})
	};
	for (const [k, id] of Object.entries(launched)) studies[k] = await finished(id);
}, 400_000);

const byMethod = (s: Study, m: string) => s.runs.filter((r) => r.method === m);
const dist = (a: number[], b: number[]) => Math.hypot(...a.map((v, i) => v - b[i]));

describe('a study over 2 inputs with bounds per input and a constraint on another output (SQP, grid starts)', () => {
	it('finishes with every run stored, starts on the 3 × 3 grid inside the bounds', () => {
		const s = studies.mapC;
		expect(s.body.status, s.body.error ?? '').toBe('done');
		expect(s.runs).toHaveLength(4 * 9);
		const starts = new Set(s.runs.map((r) => r.start.join(',')));
		expect(starts.size).toBe(9);
		// grid starts sit at cell centres: lo + (i + ½)(hi − lo)/3 (starts.ts)
		for (const st of starts) {
			const [T, w] = st.split(',').map(Number);
			expect([1 + 8 / 6, 5, 9 - 8 / 6].some((v) => Math.abs(v - T) < 1e-12)).toBe(true);
			expect([1 + 4.5 / 6, 3.25, 5.5 - 4.5 / 6].some((v) => Math.abs(v - w) < 1e-12)).toBe(true);
		}
	});

	it('every converged run meets the KKT conditions on its own fit, the constraint active with λ ≥ 0', () => {
		const s = studies.mapC;
		const cons = (m: string) => [{ fit: rebuilt(m, [T_AXIS, W_AXIS], power), op: '>=' as const, value: 3 }];
		const n = checkConverged(s, 'maximize', MAP_BOUNDS, cons);
		expect(n).toBeGreaterThanOrEqual(27);
		for (const r of s.runs.filter((x) => x.outcome === 'converged')) expect(Math.abs(power(r.x) - 3), 'P = 3 at the optimum (exact: P is bilinear, every fit reproduces it)').toBeLessThan(1e-6);
	});

	it('the smooth fits converge from every start; not-a-knot lands on SciPy’s optimum of the exact functions', () => {
		const s = studies.mapC;
		for (const m of SMOOTH_GRID) for (const r of byMethod(s, m)) expect(r.outcome, `${m} from ${r.start}`).toBe('converged');
		for (const r of byMethod(s, 'grid-cubic-not-a-knot')) expect(dist(r.x, ref.mapC)).toBeLessThan(1e-5);
		// the other smooth fits are close (within their fitting error), not exact
		for (const m of ['grid-cubic-natural', 'grid-pchip']) for (const r of byMethod(s, m)) expect(dist(r.x, ref.mapC)).toBeLessThan(0.3);
	});

	it('runs flagged at a kink end on a grid line', () => {
		checkAtKink(studies.mapC, [T_AXIS, W_AXIS]);
	});
});

describe('the same map without the constraint: BFGS and Newton from a Latin hypercube', () => {
	it('the bilinear fit stalls on grid lines; the smooth fits converge to SciPy’s optimum', () => {
		const s = studies.mapU;
		expect(s.body.status, s.body.error ?? '').toBe('done');
		expect(s.runs).toHaveLength(4 * 2 * 8);
		const lin = byMethod(s, 'grid-linear');
		expect(lin.filter((r) => r.outcome === 'converged')).toHaveLength(0);
		expect(lin.filter((r) => r.outcome === 'stalled' && r.atKink).length).toBeGreaterThanOrEqual(lin.length / 2);
		expect(checkAtKink(s, [T_AXIS, W_AXIS])).toBeGreaterThanOrEqual(lin.length / 2);
		// BFGS on every smooth fit; Newton (which steps by the Hessian) on the C2 fits — on the C1
		// PCHIP fit the curvature jumps at grid lines and Newton may cycle, reported as stalled
		for (const m of SMOOTH_GRID) for (const r of byMethod(s, m)) if (r.optimizer === 'bfgs' || m !== 'grid-pchip') expect(r.outcome, `${m}/${r.optimizer} from ${r.start}: ${r.outcome}`).toBe('converged');
		for (const r of byMethod(s, 'grid-cubic-not-a-knot')) expect(dist(r.x, ref.mapU)).toBeLessThan(1e-5);
	});

	it('every converged run is stationary on its fit (projected gradient)', () => {
		expect(checkConverged(studies.mapU, 'maximize', MAP_BOUNDS, () => [])).toBeGreaterThanOrEqual(5 * 8);
	});

	it('the scorecard ranks the bilinear fit last, with its at-kink count', () => {
		const card = studies.mapU.body.scorecard;
		expect(card).toHaveLength(8);
		expect(card.slice(-2).map((r) => r.method)).toEqual(['grid-linear', 'grid-linear']);
		for (const r of card.slice(-2)) expect(r.atKink).toBeGreaterThan(0);
		for (const r of card.filter((c) => c.method !== 'grid-linear')) {
			if (r.method !== 'grid-pchip' || r.optimizer !== 'newton') expect(r.successRate, `${r.method}/${r.optimizer}`).toBe(1);
			expect(r.best!.x).toHaveLength(2);
		}
		const linearFit = studies.mapU.body.fits.find((f) => f.method === 'grid-linear')!;
		expect(linearFit.continuity.measured).toBe('C0');
		// fidelity by leaving grid lines out: the not-a-knot fit reproduces the quadratic map exactly, the bilinear fit does not
		const nak = studies.mapU.body.fits.find((f) => f.method === 'grid-cubic-not-a-knot')!;
		expect(nak.fidelity?.looRmse).toBeLessThan(1e-12);
		expect(linearFit.fidelity?.looRmse).toBeGreaterThan(1e-4);
	});

	it('exports a surface fit as CSV samples over both inputs (values and gradients of the fit itself) and as code', async () => {
		const s = studies.mapU;
		const f = s.body.fits.find((x) => x.method === 'grid-cubic-not-a-knot')!;
		const r = await t.viewer.client.get(`/api/v1/studies/${s.body.id}/fits/${f.id}/export?format=csv`);
		expect(r.status).toBe(200);
		const lines = (await r.text()).trim().split('\r\n');
		expect(lines[0]).toBe('T [N·m],w [krpm],eta [-],deta/dT [-/N·m],deta/dw [-/krpm]');
		const rows = lines.slice(1, -1).map((l) => l.split(',').map(Number));
		expect(rows.length).toBe(101 * 101);
		const fit = s.fits.get(f.id)!;
		for (const row of [rows[0], rows[5000], rows.at(-1)!]) {
			// bit for bit what the fit's value-and-gradient path gives (the path the export samples with)
			const g = new Float64Array(2);
			expect(row[2]).toBe(fit.valueGradient(row.slice(0, 2), g));
			expect(row.slice(3)).toEqual(Array.from(g));
			// and the full evaluation (another summation order) to rounding
			const j = fit.evaluate(row.slice(0, 2));
			expect(Math.abs(row[2] - j.f)).toBeLessThanOrEqual(1e-14 * Math.max(1, Math.abs(j.f)));
			for (let k = 0; k < 2; k++) expect(Math.abs(row[3 + k] - j.grad[k])).toBeLessThanOrEqual(1e-13 * Math.max(1, Math.abs(j.grad[k])));
		}
		expect(rows.at(-1)!.slice(0, 2)).toEqual([10, 6]);
		for (const format of ['python', 'typescript']) expect((await t.viewer.client.get(`/api/v1/studies/${s.body.id}/fits/${f.id}/export?format=${format}`)).status).toBe(200);
	});
});

describe('the study page and the record for several inputs', () => {
	it('state the problem over every input, and the scorecard separates optima in both inputs', async () => {
		const s = studies.mapC;
		const page = await t.viewer.client.get(`/w/${t.ws.slug}/studies/${s.body.id}`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Maximize eta [-] for T in [1, 9], w in [1, 5.5] subject to P ≥ 3');
		// not-a-knot: every start converges to the one constrained optimum
		const row = s.body.scorecard.find((r) => r.method === 'grid-cubic-not-a-knot') as StudyBody['scorecard'][number] & { optima: { point: number[] }[]; spread: { inputs: number[] } };
		expect(row.optima).toHaveLength(1);
		expect(dist(row.optima[0].point, ref.mapC)).toBeLessThan(0.05);
		expect(row.spread.inputs).toHaveLength(2);
		for (const v of row.spread.inputs) expect(v).toBeLessThan(1e-4);
		const rec = await t.viewer.client.get(`/w/${t.ws.slug}/studies/${s.body.id}/record`);
		expect(rec.status).toBe(200);
		const doc = await rec.text();
		expect(doc).toMatch(/maximize eta over T in \[1, 9\], w in \[1, 5\.5\], subject to P &gt;= 3/);
		expect(doc).toMatch(/against T at w = /);
	});
});

describe('studies over 3 inputs', () => {
	it('bounds per input with one active (z ≥ 1): BFGS and Newton on the smooth fits converge to SciPy’s bounded optimum', () => {
		const s = studies.cubeB;
		expect(s.body.status, s.body.error ?? '').toBe('done');
		expect(s.runs).toHaveLength(3 * 2 * 6);
		expect(Math.abs(ref.cubeB[2] - 1)).toBeLessThan(1e-9); // the bound is active in the reference too
		for (const m of ['grid-cubic-not-a-knot', 'grid-akima']) for (const r of byMethod(s, m)) expect(r.outcome, `${m}/${r.optimizer} from ${r.start}`).toBe('converged');
		for (const r of byMethod(s, 'grid-cubic-not-a-knot')) expect(dist(r.x, ref.cubeB)).toBeLessThan(1e-5);
		expect(checkConverged(s, 'minimize', CUBE_BOUNDS, () => [])).toBeGreaterThanOrEqual(2 * 2 * 6);
		checkAtKink(s, X3);
		// Newton on the multilinear fit meets a singular Hessian (no curvature along each input): never a success
		for (const r of byMethod(s, 'grid-linear').filter((x) => x.optimizer === 'newton')) expect(r.outcome).not.toBe('converged');
	});

	it('a constraint on another output (h ≤ 2.5) with SQP from a 2 × 2 × 2 grid of starts', () => {
		const s = studies.cubeC;
		expect(s.body.status, s.body.error ?? '').toBe('done');
		expect(s.runs).toHaveLength(2 * 8);
		const box: [number, number][] = X3.map((a) => [a[0], a.at(-1)!]);
		const cons = (m: string) => [{ fit: rebuilt(m, X3, sum3), op: '<=' as const, value: 2.5 }];
		expect(checkConverged(s, 'minimize', box, cons)).toBe(16);
		for (const r of byMethod(s, 'grid-cubic-not-a-knot')) expect(dist(r.x, ref.cubeC)).toBeLessThan(1e-5);
		for (const r of s.runs) expect(sum3(r.x)).toBeLessThanOrEqual(2.5 + 1e-6);
	});
});

describe('a study on scattered data (RBF fits, 2 inputs)', () => {
	it('BFGS and SQP converge, each end point stationary on the exported RBF fit, near the exact optimum', () => {
		const s = studies.scat;
		expect(s.body.status, s.body.error ?? '').toBe('done');
		expect(s.runs).toHaveLength(2 * 2 * 6);
		// thin-plate (condition ≈ 1e4 here) converges from every start; the Gaussian kernel's system is
		// worse conditioned (≈ 1e6), its gradient carries rounding near 1e-8, and a run that cannot
		// get below the default gradTol there is reported as stalled — next to the optimum, not counted a success
		for (const r of byMethod(s, 'rbf-thin-plate')) expect(r.outcome, `${r.method}/${r.optimizer} from ${r.start}`).toBe('converged');
		for (const r of byMethod(s, 'rbf-gaussian')) expect(['converged', 'stalled'], `${r.optimizer} from ${r.start}`).toContain(r.outcome);
		expect(byMethod(s, 'rbf-gaussian').filter((r) => r.outcome === 'converged').length).toBeGreaterThanOrEqual(6);
		expect(checkConverged(s, 'minimize', SCAT_BOUNDS, () => [])).toBeGreaterThanOrEqual(18);
		// the RBF fits are not exact; their optimum is within the fit's error of the true one
		for (const r of s.runs) expect(dist(r.x, ref.scat)).toBeLessThan(0.05);
		expect(s.runs.some((r) => r.atKink)).toBe(false);
	});
});
