// The fit preview of grids and scattered data through the API (real server and
// database): the map over two inputs, slices through a point, the smoothness
// audit per input with the worst grid lines, and leave-one-out fidelity —
// checked against SciPy (live: RegularGridInterpolator for the bilinear map,
// RBFInterpolator refitted without each point for the RBF leave-one-out),
// exactness (not-a-knot reproduces a quadratic, so leaving grid lines out
// costs nothing) and central differences of the slices. Then every bad
// request: 422 naming the field; viewers may preview; outsiders get 404.
// All tables are INVENTED.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runScipy } from '../reference/scipy';
import { json, testDb } from './client';
import { dataset, team, type ErrorBody } from './studiesFixtures';
import { gridRows, halton } from './surfaceKkt';

afterAll(async () => {
	await testDb().destroy();
});

type Preview = {
	method: string;
	dimension: number;
	domain: [number, number][];
	through: number[];
	continuity: { declared: string; measured: string; perInput: { declared: string; measured: string; worst: { at: number; slopeJump: number; curvatureJump: number }[]; kinks: number; kinkAt: number[] }[] };
	fidelity: { method: string; looRmse: number | null; looMax: number | null; worstAt: number[] | null; points: number; condition: number | null };
	map: { inputs: [number, number]; x: number[]; y: number[]; f: (number | null)[][] };
	slices: { input: number; x: number[]; f: (number | null)[]; df: (number | null)[] }[];
	notes: string[];
};

const T_AXIS = [0, 1, 2.5, 4, 5, 6.5, 8, 10];
const W_AXIS = [0, 1, 2, 3.5, 5, 6];
const eta = ([T, w]: number[]) => 0.95 - 0.004 * (T - 6) ** 2 - 0.006 * (w - 4) ** 2 + 0.001 * (T - 6) * (w - 4);
const MAP = {
	name: 'Preview map (invented)',
	columns: [
		{ name: 'T', unit: 'N·m', role: 'input' },
		{ name: 'w', unit: 'krpm', role: 'input' },
		{ name: 'eta', role: 'output' }
	],
	rows: gridRows([T_AXIS, W_AXIS], [eta])
};
const X3 = [
	[0, 1, 2, 3],
	[0, 0.5, 1],
	[-1, -0.3, 0.4, 1]
];
const CUBE = { name: 'Preview cube (invented)', columns: [{ name: 'a', role: 'input' }, { name: 'b', role: 'input' }, { name: 'c', role: 'input' }, { name: 'g', role: 'output' }], rows: gridRows(X3, [([a, b, c]) => a * a + b - c * c * c]) };
const SCAT_PTS = halton(30, [
	[0, 2],
	[0, 1]
]);
const SCATTER = { name: 'Preview scatter (invented)', columns: [{ name: 'u', role: 'input' }, { name: 'v', role: 'input' }, { name: 'q', role: 'output' }], rows: SCAT_PTS.map(([u, v]) => [u, v, Math.sin(2 * u) + v * v]) };
const THIN = { name: 'Preview thin grid (invented)', columns: [{ name: 'p', role: 'input' }, { name: 's', role: 'input' }, { name: 'y', role: 'output' }], rows: gridRows([[0, 1], [0, 1, 2, 3]], [([p, s]) => p + s]) };

let t: Awaited<ReturnType<typeof team>>;
const ids: Record<string, string> = {};

beforeAll(async () => {
	t = await team('sprev');
	for (const [k, body] of Object.entries({ map: MAP, cube: CUBE, scatter: SCATTER, thin: THIN })) ids[k] = await dataset(t.editor.client, t.ws.slug, body);
});

async function preview(body: unknown, id = ids.map, who: 'viewer' | 'outsider' = 'viewer') {
	const r = await t[who].client.post(`/api/v1/datasets/${id}/fit-preview`, body);
	return { status: r.status, body: await json<Preview & ErrorBody>(r) };
}

describe('the fit preview of a grid', () => {
	it('grid-linear: C0 along both inputs with the worst grid lines named; the map matches SciPy’s RegularGridInterpolator (live)', async () => {
		const { status, body: p } = await preview({ output: 'eta', method: 'grid-linear', resolution: 21 });
		expect(status, JSON.stringify(p)).toBe(200);
		expect(p.continuity.measured).toBe('C0');
		expect(p.continuity.perInput.map((c) => c.measured)).toEqual(['C0', 'C0']);
		for (const [k, axis] of [T_AXIS, W_AXIS].entries()) {
			const c = p.continuity.perInput[k];
			expect(c.kinks).toBe(axis.length - 2); // every interior line of a curved surface is a kink of the bilinear fit
			expect(c.kinkAt).toEqual(axis.slice(1, -1));
			expect(c.worst.length).toBeGreaterThan(0);
			for (const l of c.worst) {
				expect(axis.slice(1, -1)).toContain(l.at);
				expect(l.slopeJump).toBeGreaterThan(1e-4);
			}
		}
		expect(p.map.x).toHaveLength(21);
		expect(p.map.y).toHaveLength(21);
		expect(p.map.f).toHaveLength(21);
		const ref = runScipy<number[][]>(
			`from scipy.interpolate import RegularGridInterpolator
g = RegularGridInterpolator((np.array(data['T']), np.array(data['w'])), np.array(data['v']).reshape(len(data['T']), len(data['w'])), method='linear')
X, Y = np.meshgrid(np.array(data['x']), np.array(data['y']))
out = g(np.stack([X.ravel(), Y.ravel()], axis=1)).reshape(X.shape)`,
			{ T: T_AXIS, w: W_AXIS, v: MAP.rows.map((r) => r[2]), x: p.map.x, y: p.map.y }
		);
		let worst = 0;
		p.map.f.forEach((row, j) => row.forEach((v, i) => (worst = Math.max(worst, Math.abs(v! - ref[j][i]) / Math.max(1, Math.abs(ref[j][i]))))));
		expect(worst).toBeLessThan(1e-12);
		// the slice through the centre holds the data's grid values of that input
		expect(p.through).toEqual([5, 3]);
		const sT = p.slices[0];
		for (const v of T_AXIS) expect(sT.x).toContain(v);
	});

	it('grid-cubic-not-a-knot: C2 along both inputs, no kinks; leaving grid lines out costs nothing on a quadratic; slopes are the derivative of the slice', async () => {
		const { status, body: p } = await preview({ output: 'eta', method: 'grid-cubic-not-a-knot', through: [6, 4] });
		expect(status, JSON.stringify(p)).toBe(200);
		expect(p.continuity.perInput.map((c) => c.measured)).toEqual(['C2', 'C2']);
		expect(p.continuity.perInput.map((c) => c.kinks)).toEqual([0, 0]);
		expect(p.continuity.perInput.map((c) => c.kinkAt)).toEqual([[], []]);
		expect(p.fidelity.method).toBe('grid-lines');
		expect(p.fidelity.points).toBeGreaterThan(0);
		expect(p.fidelity.looRmse!).toBeLessThan(1e-12);
		// the slices through the exact optimum (6, 4): f is eta there, and the slope crosses zero at 6 and at 4
		for (const s of p.slices) {
			s.x.forEach((x, i) => {
				const pt = s.input === 0 ? [x, 4] : [6, x];
				expect(Math.abs(s.f[i]! - eta(pt))).toBeLessThan(1e-12);
			});
			// slopes against the exact derivative of eta (the fit reproduces it): ∂/∂T = −0.008(T − 6) at w = 4, ∂/∂w = −0.012(w − 4) at T = 6
			s.x.forEach((x, i) => expect(Math.abs(s.df[i]! - (s.input === 0 ? -0.008 * (x - 6) : -0.012 * (x - 4)))).toBeLessThan(1e-12));
			// and against the slice's own values: a secant of a quadratic is its slope at the secant's midpoint (common practice, no source)
			for (let i = 1; i + 1 < s.x.length; i += 17) {
				const secant = (s.f[i + 1]! - s.f[i - 1]!) / (s.x[i + 1] - s.x[i - 1]);
				const mid = 0.5 * (s.x[i + 1] + s.x[i - 1]);
				expect(Math.abs(secant - (s.input === 0 ? -0.008 * (mid - 6) : -0.012 * (mid - 4)))).toBeLessThan(1e-9);
			}
			const at = s.x.findIndex((x) => x === (s.input === 0 ? 6 : 4));
			if (at >= 0) expect(Math.abs(s.df[at]!)).toBeLessThan(1e-12);
		}
		expect(Math.max(...p.map.f.flat().map((v) => v!))).toBeLessThanOrEqual(0.95 + 1e-12);
	});

	it('three inputs: the map spans the two named inputs through the chosen point; slices along all three', async () => {
		const { status, body: p } = await preview({ output: 'g', method: 'grid-cubic-not-a-knot', map: ['c', 'a'], through: [1.5, 0.5, 0.25], resolution: 5 }, ids.cube);
		expect(status, JSON.stringify(p)).toBe(200);
		expect(p.map.inputs).toEqual([2, 0]);
		expect(p.map.x).toEqual([-1, -0.5, 0, 0.5, 1]);
		// g = a² + b − c³ is reproduced (not-a-knot, exact for cubics on 4 points and lines on 3): f at (a, 0.5, c)
		p.map.f.forEach((row, j) => row.forEach((v, i) => expect(Math.abs(v! - (p.map.y[j] ** 2 + 0.5 - p.map.x[i] ** 3))).toBeLessThan(1e-12)));
		expect(p.slices.map((s) => s.input)).toEqual([0, 1, 2]);
	});
});

describe('the fit preview of scattered data', () => {
	it('rbf-thin-plate: leave-one-out by Rippa’s closed form equals refitting SciPy’s RBFInterpolator without each point (live)', async () => {
		const { status, body: p } = await preview({ output: 'q', method: 'rbf-thin-plate' }, ids.scatter);
		expect(status, JSON.stringify(p)).toBe(200);
		expect(p.fidelity.method).toBe('rippa');
		expect(p.fidelity.points).toBe(30);
		expect(p.continuity.perInput).toHaveLength(2);
		// SciPy scales nothing itself; our fit works in inputs scaled to unit range, so SciPy gets the same scaled points
		const ref = runScipy<{ rmse: number; max: number }>(
			`from scipy.interpolate import RBFInterpolator
P = np.array(data['p']); y = np.array(data['y'])
lo = P.min(axis=0); span = P.max(axis=0) - lo
U = (P - lo) / span
e = []
for i in range(len(y)):
    keep = np.arange(len(y)) != i
    f = RBFInterpolator(U[keep], y[keep], kernel='thin_plate_spline', degree=1)
    e.append(f(U[i:i+1])[0] - y[i])
e = np.array(e)
out = {'rmse': float(np.sqrt(np.mean(e**2))), 'max': float(np.max(np.abs(e)))}`,
			{ p: SCAT_PTS, y: SCATTER.rows.map((r) => r[2]) }
		);
		expect(Math.abs(p.fidelity.looRmse! - ref.rmse) / ref.rmse).toBeLessThan(1e-6);
		expect(Math.abs(p.fidelity.looMax! - ref.max) / ref.max).toBeLessThan(1e-6);
		expect(p.fidelity.condition).toBeGreaterThan(1);
	});

	it('grid methods are refused on scattered data, naming the method', async () => {
		const { status, body } = await preview({ output: 'q', method: 'grid-pchip' }, ids.scatter);
		expect(status).toBe(422);
		expect(body.error.details?.map((d) => d.field)).toContain('method');
		expect(body.error.message).toMatch(/grid-pchip needs the inputs on a full grid; this dataset is scattered/);
	});
});

describe('bad fit-preview requests for several inputs: 422 naming the field', () => {
	const cases: [string, unknown, string, RegExp, string?][] = [
		['a curve method', { output: 'eta', method: 'pchip' }, 'method', /method must be one of grid-linear, .*rbf-gaussian/],
		['a missing output', { output: 'torque', method: 'grid-linear' }, 'output', /no output column "torque"; its outputs are "eta"/],
		['an input as output', { output: 'T', method: 'grid-linear' }, 'output', /no output column "T"/],
		['through of the wrong length', { output: 'eta', method: 'grid-linear', through: [1] }, 'through', /give one number per input: 1 given, and the dataset has 2 \(T, w\)/],
		['through outside the data', { output: 'eta', method: 'grid-linear', through: [11, 3] }, 'through.0', /11 lies outside the data \[0, 10\] of input 1 \("T"\)/],
		['a map over an unknown input', { output: 'eta', method: 'grid-linear', map: ['T', 'speed'] }, 'map.1', /"speed" is not an input of this dataset; its inputs are "T", "w"/],
		['a map over one input twice', { output: 'eta', method: 'grid-linear', map: ['T', 'T'] }, 'map', /two different inputs/],
		['a resolution too small', { output: 'eta', method: 'grid-linear', resolution: 2 }, 'resolution', /at least 5/],
		['an RBF option on a grid fit', { output: 'eta', method: 'grid-akima', options: { smoothing: 0.1 } }, 'options.smoothing', /smoothing applies to rbf-\* methods, not grid-akima/],
		['epsilon on thin-plate', { output: 'q', method: 'rbf-thin-plate', options: { epsilon: 2 } }, 'options.epsilon', /epsilon applies to rbf-multiquadric and rbf-gaussian/, 'scatter'],
		['an extrapolation a surface does not have', { output: 'eta', method: 'grid-linear', options: { extrapolation: 'hold' } }, 'options.extrapolation', /refuse or extend/],
		['an unknown option', { output: 'eta', method: 'grid-linear', options: { tension: 1 } }, 'options', /unknown option "tension"/],
		['too few grid values for the method', { output: 'y', method: 'grid-akima' }, 'method', /input 1 \("p"\) has 2 grid values; the method needs at least 3 per input/, 'thin'],
		['a curve-only field', { output: 'eta', method: 'grid-linear', at: [1] }, '(body)', /unknown field "at"; a fit preview of several inputs takes output, method, options, through, map and resolution \(at is for curves: use through\)/]
	];
	for (const [what, body, field, message, on] of cases) {
		it(what, async () => {
			const { status, body: b } = await preview(body, ids[on ?? 'map']);
			expect(status, JSON.stringify(b)).toBe(422);
			expect(b.error.details?.map((d) => d.field), JSON.stringify(b)).toContain(field);
			expect(b.error.message).toMatch(message);
		});
	}

	it('an outsider cannot tell the dataset exists', async () => {
		const { status } = await preview({ output: 'eta', method: 'grid-linear' }, ids.map, 'outsider');
		expect(status).toBe(404);
	});
});
