// Launching a study with bad input: 422 (or 403/400) naming the field, and nothing stored.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { json, testDb } from './client';
import { dataset, stored, team, type ErrorBody } from './studiesFixtures';

afterAll(async () => {
	await testDb().destroy();
});

let t: Awaited<ReturnType<typeof team>>;
let datasetId: string;
let gridId: string;

beforeAll(async () => {
	t = await team('bad');
	datasetId = await dataset(t.editor.client, t.ws.slug);
	const rows: number[][] = [];
	for (const a of [1, 2, 3]) for (const b of [10, 20, 30]) rows.push([a, b, a * b]);
	gridId = await dataset(t.editor.client, t.ws.slug, {
		name: 'Small grid (invented)',
		columns: [
			{ name: 'a', role: 'input' },
			{ name: 'b', role: 'input' },
			{ name: 'p', role: 'output' }
		],
		rows
	});
});

const good = () => ({
	datasetId,
	output: 'eta',
	problem: { kind: 'maximize' } as Record<string, unknown>,
	fits: [{ method: 'pchip' }] as Record<string, unknown>[],
	optimizers: [{ method: 'sqp' }] as Record<string, unknown>[],
	starts: { grid: 5 } as Record<string, unknown>
});

/** Launch `body` as `who`; expect `status`, an error naming `field`, and nothing stored. */
async function refused(body: unknown, status: number, field: string | null, message: RegExp, who: 'editor' | 'viewer' = 'editor') {
	const before = await stored(t.ws.id);
	const r = await t[who].client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, body);
	const b = await json<ErrorBody>(r);
	expect(r.status, JSON.stringify(b)).toBe(status);
	expect(b.error.message).toMatch(message);
	if (field) expect(b.error.details?.map((d) => d.field), JSON.stringify(b)).toContain(field);
	expect(await stored(t.ws.id)).toEqual(before);
	return b;
}

describe('launching a study with bad input', () => {
	it('an unknown fit method', async () => {
		await refused({ ...good(), fits: [{ method: 'cubic-magic' }] }, 422, 'fits.0.method', /unknown fit method; one of linear, cubic-natural/);
	});

	it('an unknown optimizer', async () => {
		await refused({ ...good(), optimizers: [{ method: 'sqp' }, { method: 'lbfgs' }] }, 422, 'optimizers.1.method', /unknown optimizer; one of sqp, bfgs/);
	});

	it('options out of range, and options that belong to another method', async () => {
		await refused({ ...good(), optimizers: [{ method: 'bfgs', options: { gradTol: 5 } }] }, 422, 'optimizers.0.options.gradTol', /gradTol must be at most 1/);
		await refused({ ...good(), optimizers: [{ method: 'bfgs', options: { maxIterations: 0 } }] }, 422, 'optimizers.0.options.maxIterations', /maxIterations must be at least 1/);
		await refused({ ...good(), budgets: { maxMilliseconds: 3_600_000 } }, 422, 'budgets.maxMilliseconds', /at most 60,000/);
		await refused({ ...good(), fits: [{ method: 'polynomial-least-squares', options: { degree: 99 } }] }, 422, 'fits.0.options.degree', /degree must be at most 15/);
		await refused({ ...good(), fits: [{ method: 'pchip', options: { degree: 3 } }] }, 422, 'fits.0.options.degree', /degree applies only to polynomial-least-squares/);
		await refused({ ...good(), fits: [{ method: 'pchip', options: { smoothness: 3 } }] }, 422, 'fits.0.options', /unknown fit option "smoothness"/);
		// the numerics refuse what the schema cannot see: a degree too high for 8 points
		await refused({ ...good(), fits: [{ method: 'polynomial-least-squares', options: { degree: 12 } }] }, 422, 'fits.0', /polynomial-least-squares on "eta"/);
	});

	it('bounds outside the data with the refuse extrapolation rule', async () => {
		const b = await refused({ ...good(), problem: { kind: 'maximize', bounds: [[0, 2]] } }, 422, 'problem.bounds', /go outside the data \[0\.1, 1\.5\] and fit 0 \(pchip\) uses the refuse extrapolation rule/);
		expect(b.error.code).toBe('invalid');
		await refused({ ...good(), problem: { kind: 'maximize', bounds: [[1, 0.5]] } }, 422, 'problem.bounds.0', /lower bound must be below the upper bound/);
	});

	it('bounds outside the data are fine when the fits may extrapolate', async () => {
		const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, {
			...good(),
			problem: { kind: 'maximize', bounds: [[0, 1.6]] },
			fits: [{ method: 'pchip', options: { extrapolation: 'linear' } }],
			starts: { points: [[0.05]] }
		});
		expect(r.status).toBe(202);
	});

	it('a constraint on a missing output, or on the output itself', async () => {
		const problem = { kind: 'maximize', constraints: [{ output: 'thrust', op: '>=', value: 0.05 }] };
		await refused({ ...good(), problem }, 422, 'problem.constraints.0.output', /"thrust" is not an output of "Coarse prop sweep \(invented\)"; its outputs are "eta", "CT"/);
		await refused({ ...good(), problem: { kind: 'maximize', constraints: [{ output: 'eta', op: '<=', value: 1 }] } }, 422, 'problem.constraints.0.output', /is the output being optimized/);
		await refused({ ...good(), problem: { kind: 'maximize', constraints: [{ output: 'CT', op: '≥', value: 1 }] } }, 422, 'problem.constraints.0.op', /op must be/);
	});

	it('a constraint with an optimizer that cannot handle constraints', async () => {
		const problem = { kind: 'maximize', constraints: [{ output: 'CT', op: '>=', value: 0.05 }] };
		await refused({ ...good(), problem, optimizers: [{ method: 'sqp' }, { method: 'bfgs' }] }, 422, 'optimizers.1.method', /bfgs does not handle constraints/);
	});

	it('zero starts', async () => {
		await refused({ ...good(), starts: { points: [] } }, 422, 'starts.points', /zero starts/);
		await refused({ ...good(), starts: { grid: 0 } }, 422, 'starts.grid', /must be at least 1/);
		await refused({ ...good(), starts: {} }, 422, 'starts', /zero starts: give points, grid or latinHypercube/);
		await refused({ ...good(), starts: { points: [[0.01]] } }, 422, 'starts.points.0', /outside the bounds \[0\.1, 1\.5\]/);
	});

	it('more than 100,000 runs', async () => {
		const fits = ['linear', 'pchip', 'akima', 'akima-modified', 'cubic-natural', 'cubic-not-a-knot', 'local-quadratic', 'local-cubic', 'softened-linear', 'polynomial-global', 'smoothing-spline'].map(
			(method) => ({ method })
		);
		const optimizers = ['sqp', 'bfgs', 'nelder-mead', 'conjugate-gradient', 'steepest-descent', 'newton', 'sqp', 'bfgs', 'nelder-mead', 'newton'].map((method) => ({ method }));
		await refused({ ...good(), fits, optimizers, starts: { latinHypercube: 1000, seed: 1 } }, 422, 'starts', /11 fits × 10 optimizers × 1000 starts = 110,000 runs; a study can have at most 100,000/);
		await refused({ ...good(), starts: { latinHypercube: 1001, seed: 1 } }, 422, 'starts.latinHypercube', /at most 1,000/);
	});

	it('a viewer launching', async () => {
		await refused(good(), 403, null, /this needs the editor role; you are a viewer/, 'viewer');
	});

	it('a grid dataset, a dataset of another workspace, an output that is not there', async () => {
		await refused({ ...good(), datasetId: gridId, output: 'p' }, 422, 'fits.0.method', /pchip is a curve method \(one input\); "Small grid \(invented\)" is a grid of 2 inputs/);
		await refused({ ...good(), datasetId: '00000000-0000-4000-8000-000000000000' }, 422, 'datasetId', /no dataset with this id in this workspace/);
		await refused({ ...good(), output: 'J' }, 422, 'output', /"J" is not an output/);
		await refused({ ...good(), datasetId: 'nope' }, 422, 'datasetId', /datasetId must be a dataset id/);
	});

	it('a solve problem without a target; a target on a maximize problem', async () => {
		await refused({ ...good(), problem: { kind: 'solve' } }, 422, 'problem.target', /a solve problem needs a target/);
		await refused({ ...good(), problem: { kind: 'maximize', target: 3 } }, 422, 'problem.target', /target is only for solve problems/);
		await refused({ ...good(), problem: { kind: 'optimize' } }, 422, 'problem.kind', /minimize, maximize or solve/);
	});

	it('a body that is not JSON', async () => {
		const before = await stored(t.ws.id);
		const r = await t.editor.client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, '{"datasetId":', { 'content-type': 'application/json' });
		expect(r.status).toBe(400);
		expect((await json<ErrorBody>(r)).error.code).toBe('bad-json');
		expect(await stored(t.ws.id)).toEqual(before);
	});

	it('outsiders cannot tell the workspace exists', async () => {
		const r = await t.outsider.client.post(`/api/v1/workspaces/${t.ws.slug}/studies`, good());
		expect(r.status).toBe(404);
	});
});
