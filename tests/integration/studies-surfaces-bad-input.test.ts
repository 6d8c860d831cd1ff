// Bad input for tables of several inputs, through the real API: each answer is
// a 4xx in the API's error shape naming the field (or the row / cell), and
// nothing is stored — no dataset, no study, no fit, no queued job.
// All tables are INVENTED.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { json, testDb } from './client';
import { upload } from './datasetHelpers';
import { dataset, stored, team, type ErrorBody } from './studiesFixtures';
import { gridRows, halton } from './surfaceKkt';

afterAll(async () => {
	await testDb().destroy();
});

let t: Awaited<ReturnType<typeof team>>;
const ids: Record<string, string> = {};

const cols = (inputs: string[], outputs: string[]) => [...inputs.map((name) => ({ name, role: 'input' })), ...outputs.map((name) => ({ name, role: 'output' }))];
const MAP_AXES = [
	[0, 2, 4, 6, 8],
	[1, 2, 3, 4]
];
const MAP = { name: 'Small map (invented)', columns: cols(['T', 'w'], ['eta', 'P']), rows: gridRows(MAP_AXES, [([T, w]) => 0.9 - 0.01 * (T - 4) ** 2 - 0.02 * (w - 2.5) ** 2, ([T, w]) => T * w]) };
/** the same map with the cell (T = 4, w = 3) left out */
const HOLED = { ...MAP, name: 'Map with a hole (invented)', rows: MAP.rows.filter(([T, w]) => !(T === 4 && w === 3)) };

beforeAll(async () => {
	t = await team('surfbad');
	const c = t.editor.client;
	ids.map = await dataset(c, t.ws.slug, MAP);
	// two values on T only: too few for grid-akima (needs 3 per input)
	ids.thin = await dataset(c, t.ws.slug, { name: 'Thin grid (invented)', columns: cols(['a', 'b'], ['p']), rows: gridRows([[0, 1], [0, 1, 2, 3]], [([a, b]) => a + b * b]) });
	// 7 inputs: a scatter of 12 Halton points
	const box7 = Array.from({ length: 7 }, () => [0, 1] as [number, number]);
	ids.seven = await dataset(c, t.ws.slug, { name: 'Seven inputs (invented)', columns: cols(['x1', 'x2', 'x3', 'x4', 'x5', 'x6', 'x7'], ['y']), rows: halton(12, box7.slice(0, 6)).map((p, i) => [...p, (i * 0.37) % 1, p[0] + p[1]]) });
	// 5 inputs on a full 2^5 grid: too many for a grid fit, fine for an RBF
	const two = [0, 1];
	ids.five = await dataset(c, t.ws.slug, { name: 'Five-input grid (invented)', columns: cols(['x1', 'x2', 'x3', 'x4', 'x5'], ['y']), rows: gridRows([two, two, two, two, two], [(x) => x.reduce((s, v) => s + v, 0)]) });
	// two points that the RBF's unit scaling maps onto one (rows 2 and 3 differ in the last bit of a only)
	ids.coincident = await dataset(c, t.ws.slug, {
		name: 'Points that coincide once scaled (invented)',
		columns: cols(['a', 'b'], ['y']),
		rows: [
			[-1e6, 0, 1],
			[0.3, 0.5, 2],
			[0.30000000000000004, 0.5, 3],
			[1, 1, 4],
			[0.5, 0.2, 5],
			[0.7, 0.9, 6]
		]
	});
});

const good = () => ({
	datasetId: ids.map,
	output: 'eta',
	problem: { kind: 'maximize', bounds: [[1, 7], [1.5, 3.5]] } as Record<string, unknown>,
	fits: [{ method: 'grid-cubic-natural' }] as Record<string, unknown>[],
	optimizers: [{ method: 'sqp' }] as Record<string, unknown>[],
	starts: { grid: 2 } as Record<string, unknown>
});

/** Launch `body`; expect `status`, an error naming `field`, and nothing stored. */
async function refused(body: unknown, status: number, field: string, message: RegExp) {
	const before = await stored(t.ws.id);
	const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, body);
	const b = await json<ErrorBody>(r);
	expect(r.status, JSON.stringify(b)).toBe(status);
	expect(b.error.message).toMatch(message);
	expect(b.error.details?.map((d) => d.field), JSON.stringify(b)).toContain(field);
	expect(await stored(t.ws.id)).toEqual(before);
	return b;
}

const datasetCount = async () => Number((await testDb()('datasets').where({ workspace_id: t.ws.id }).count<{ n: string }[]>('* as n'))[0].n);

describe('launching a study over several inputs with bad input', () => {
	it('the good request is accepted (so each refusal below is about its one change)', async () => {
		const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, good());
		expect(r.status, await r.clone().text()).toBe(202);
	});

	it('fewer grid values on an input than the method needs: names the method field and the input', async () => {
		const b = await refused({ ...good(), datasetId: ids.thin, output: 'p', problem: { kind: 'minimize' }, fits: [{ method: 'grid-akima' }] }, 422, 'fits.0.method', /grid-akima on "p": input 1 \("a"\) has 2 grid values; the method needs at least 3 per input/);
		expect(b.error.code).toBe('invalid');
		// the same table with a method that needs 2 is fine
		const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, { ...good(), datasetId: ids.thin, output: 'p', problem: { kind: 'minimize' }, fits: [{ method: 'grid-pchip' }] });
		expect(r.status).toBe(202);
	});

	it('points that coincide once scaled to unit range: the rows are named', async () => {
		await refused({ ...good(), datasetId: ids.coincident, output: 'y', problem: { kind: 'minimize' }, fits: [{ method: 'rbf-thin-plate' }] }, 422, 'fits.0', /rbf-thin-plate on "y": rows 2 and 3 differ by less than the rounding of the inputs scaled to unit range, so they coincide; an interpolant cannot take two values there/);
	});

	it('more inputs than supported: 7 for any study, 5 for a grid fit', async () => {
		await refused({ ...good(), datasetId: ids.seven, output: 'y', problem: { kind: 'minimize' }, fits: [{ method: 'rbf-thin-plate' }] }, 422, 'datasetId', /has 7 inputs; a study takes at most 6 \(scattered fits\) or 4 \(grid fits\)/);
		await refused({ ...good(), datasetId: ids.five, output: 'y', problem: { kind: 'minimize' }, fits: [{ method: 'grid-linear' }] }, 422, 'fits.0.method', /grid-linear takes at most 4 inputs; "Five-input grid \(invented\)" has 5: use an rbf-\* method/);
		const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, { ...good(), datasetId: ids.five, output: 'y', problem: { kind: 'minimize' }, fits: [{ method: 'rbf-thin-plate' }], starts: { latinHypercube: 3, seed: 1 } });
		expect(r.status, 'an RBF takes the 5-input grid').toBe(202);
	});

	it('a constraint on a missing output, or on the optimized output', async () => {
		await refused({ ...good(), problem: { kind: 'maximize', constraints: [{ output: 'torque', op: '>=', value: 2 }] } }, 422, 'problem.constraints.0.output', /"torque" is not an output of "Small map \(invented\)"; its outputs are "eta", "P"/);
		await refused({ ...good(), problem: { kind: 'maximize', constraints: [{ output: 'T', op: '>=', value: 2 }] } }, 422, 'problem.constraints.0.output', /"T" is not an output/);
		await refused({ ...good(), problem: { kind: 'maximize', constraints: [{ output: 'eta', op: '<=', value: 1 }] } }, 422, 'problem.constraints.0.output', /is the output being optimized/);
	});

	it('bounds of the wrong length, reversed, or outside the data under the refuse rule', async () => {
		await refused({ ...good(), problem: { kind: 'maximize', bounds: [[1, 7]] } }, 422, 'problem.bounds', /give one \[lo, hi\] per input: 1 given, and "Small map \(invented\)" has 2 inputs \(T, w\)/);
		await refused({ ...good(), problem: { kind: 'maximize', bounds: [[1, 7], [1, 2], [0, 1]] } }, 422, 'problem.bounds', /3 given/);
		await refused({ ...good(), problem: { kind: 'maximize', bounds: Array.from({ length: 7 }, () => [0, 1]) } }, 422, 'problem.bounds', /at most 6 inputs, so at most 6 bounds/);
		await refused({ ...good(), problem: { kind: 'maximize', bounds: [[1, 7], [3, 2]] } }, 422, 'problem.bounds.1', /lower bound must be below the upper bound/);
		await refused({ ...good(), problem: { kind: 'maximize', bounds: [[1, 7], [0, 3]] } }, 422, 'problem.bounds.1', /bounds \[0, 3\] on w go outside the data \[1, 4\] and fit 0 \(grid-cubic-natural\) uses the refuse extrapolation rule/);
	});

	it('starts of the wrong dimension, or too many grid starts over the inputs', async () => {
		await refused({ ...good(), starts: { points: [[2, 2], [3]] } }, 422, 'starts.points.1', /start 1 has 1 coordinate; "Small map \(invented\)" has 2 inputs \(T, w\)/);
		await refused({ ...good(), starts: { grid: 40 } }, 422, 'starts.grid', /40 starts per input over 2 inputs make 1,600 starts; a study takes at most 1,000/);
		await refused({ ...good(), starts: { points: [[0.5, 2]] } }, 422, 'starts.points.0', /start 0\.5 on T lies outside the bounds \[1, 7\]/);
	});

	it('curve methods and curve-only options on a surface; a tail degree an RBF does not have', async () => {
		await refused({ ...good(), fits: [{ method: 'pchip' }] }, 422, 'fits.0.method', /pchip is a curve method/);
		await refused({ ...good(), fits: [{ method: 'grid-pchip', options: { duplicates: 'average' } }] }, 422, 'fits.0.options.duplicates', /duplicates applies to curve fits, not grid-pchip/);
		await refused({ ...good(), fits: [{ method: 'grid-akima', options: { extrapolation: 'hold' } }] }, 422, 'fits.0.options.extrapolation', /grid-akima extrapolates by refuse or extend, not hold/);
		await refused({ ...good(), fits: [{ method: 'rbf-gaussian', options: { degree: 2 } }] }, 422, 'fits.0.options.degree', /degree −1 \(none\), 0 or 1, not 2/);
	});
});

describe('a grid with a missing cell', () => {
	it('is refused at upload naming the cell, offering to take it as scattered points; nothing stored', async () => {
		const before = await datasetCount();
		const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, HOLED);
		const b = await json<ErrorBody>(r);
		expect(r.status, JSON.stringify(b)).toBe(422);
		expect(b.error.message).toMatch(/a 5 × 4 grid, but 1 of its 20 points is missing: \(T = 4, w = 3\); add the missing rows, or treat the table as scattered points \(shape "scatter"\)/);
		expect(b.error.details?.[0].problem).toMatch(/\(T = 4, w = 3\)/);
		expect(await datasetCount()).toBe(before);
	});

	it('a shape other than "scatter" is refused naming the field; nothing stored', async () => {
		const before = await datasetCount();
		for (const shape of ['grid', 'curve', 3]) {
			const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, { ...HOLED, shape });
			const b = await json<ErrorBody>(r);
			expect(r.status, JSON.stringify(b)).toBe(422);
			expect(b.error.details?.map((d) => d.field)).toContain('shape');
			expect(b.error.message).toMatch(/shape may only be "scatter"/);
		}
		expect(await datasetCount()).toBe(before);
	});

	it('taken as scattered points when asked (JSON or upload field): RBF studies run, grid fits are refused', async () => {
		const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, { ...HOLED, shape: 'scatter' });
		const b = await json<{ id: string; shape: string; warnings: string[] }>(r);
		expect(r.status, JSON.stringify(b)).toBe(201);
		expect(b.shape).toBe('scatter');
		expect(b.warnings.join(' ')).toMatch(/1 of 20 points missing: \(T = 4, w = 3\)\); taken as scattered points, as asked/);
		const csv = ['T,w,eta,P', ...HOLED.rows.map((row) => row.join(','))].join('\n');
		const up = await upload(t.editor.client, t.ws.slug, csv, 'holed.csv', { name: 'Holed map upload', roles: JSON.stringify({ T: 'input', w: 'input' }), shape: 'scatter' });
		expect(up.status, await up.clone().text()).toBe(201);
		expect((await json<{ shape: string }>(up)).shape).toBe('scatter');

		await refused({ ...good(), datasetId: b.id, fits: [{ method: 'grid-linear' }] }, 422, 'fits.0.method', /grid-linear needs the inputs on a full grid; "Map with a hole \(invented\)" is scattered \(taken as scattered points, as asked/);
		const ok = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, { ...good(), datasetId: b.id, fits: [{ method: 'rbf-thin-plate' }] });
		expect(ok.status, await ok.clone().text()).toBe(202);
	});
});

describe('axes listed in any order', () => {
	it('rows shuffled and listed with decreasing inputs give the same fit as sorted rows (the axes are the sorted distinct values)', async () => {
		const shuffled = [...MAP.rows].reverse();
		shuffled.push(shuffled.splice(3, 1)[0]);
		const sid = await dataset(t.editor.client, t.ws.slug, { ...MAP, name: 'Map, rows shuffled (invented)', rows: shuffled });
		const fitOf = async (datasetId: string) => {
			const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, { ...good(), datasetId, fits: [{ method: 'grid-cubic-not-a-knot' }] });
			const { id } = await json<{ id: string }>(r);
			expect(r.status).toBe(202);
			const s = await json<{ fits: { id: string }[] }>(await t.editor.client.get(`/api/v1/studies/${id}`));
			const ex = await json<{ fit: { axes: number[][]; data: number[] } }>(await t.editor.client.get(`/api/v1/studies/${id}/fits/${s.fits[0].id}/export?format=json`));
			return ex.fit;
		};
		const [a, b] = [await fitOf(ids.map), await fitOf(sid)];
		expect(b.axes).toEqual(MAP_AXES);
		expect(b.data).toEqual(a.data);
	});
});
