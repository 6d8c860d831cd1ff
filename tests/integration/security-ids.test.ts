import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { Client, json, testDb } from './client';
import { dataset, launch, team, waitFor, type RunBody } from './studiesFixtures';

// Ids must not leak to strangers: a signed-out caller gets the same answer for an
// existing id and a made-up one, and run ids are random, not a counter.
let t: Awaited<ReturnType<typeof team>>;
let datasetId: string;
let studyId: string;
let runs: RunBody[];

beforeAll(async () => {
	t = await team('ids');
	datasetId = await dataset(t.editor.client, t.ws.slug);
	studyId = await launch(t.editor.client, t.ws.slug, {
		name: 'Ids',
		datasetId,
		output: 'eta',
		problem: { kind: 'maximize' },
		fits: [{ method: 'linear' }, { method: 'pchip' }],
		optimizers: [{ method: 'bfgs' }],
		starts: { latinHypercube: 4, seed: 1 }
	});
	await waitFor(t.editor.client, studyId);
	runs = (await json<{ runs: RunBody[] }>(await t.editor.client.get(`/api/v1/studies/${studyId}/runs`))).runs;
}, 120_000);

async function answer(c: Client, method: string, path: string, body?: unknown) {
	const r = await c.request(method, path, body);
	return { status: r.status, body: await r.text() };
}

describe('signed-out callers cannot tell existing ids from made-up ones', () => {
	it('answers datasets, studies and run paths alike for real and invented ids', async () => {
		const anonymous = new Client();
		const fake = randomUUID();
		const pairs: [string, string, string, unknown?][] = [
			['GET', `/api/v1/datasets/${datasetId}`, `/api/v1/datasets/${fake}`],
			['GET', `/api/v1/datasets/${datasetId}/export`, `/api/v1/datasets/${fake}/export`],
			['POST', `/api/v1/datasets/${datasetId}/fit-preview`, `/api/v1/datasets/${fake}/fit-preview`, { output: 'eta', fits: [{ method: 'linear' }] }],
			['POST', `/api/v1/datasets/${datasetId}/archive`, `/api/v1/datasets/${fake}/archive`, {}],
			['DELETE', `/api/v1/datasets/${datasetId}`, `/api/v1/datasets/${fake}`],
			['GET', `/api/v1/studies/${studyId}`, `/api/v1/studies/${fake}`],
			['GET', `/api/v1/studies/${studyId}/runs`, `/api/v1/studies/${fake}/runs`],
			['GET', `/api/v1/runs/${runs[0].id}/path`, `/api/v1/runs/${fake}/path`]
		];
		for (const [method, real, invented, body] of pairs) {
			const a = await answer(anonymous, method, real, body);
			const b = await answer(anonymous, method, invented, body);
			expect(a, `${method} ${real}`).toEqual(b);
			expect(a.status, `${method} ${real}`).toBe(401);
		}
		// nothing was changed by the anonymous delete and archive
		expect((await t.editor.client.get(`/api/v1/datasets/${datasetId}`)).status).toBe(200);
		expect((await testDb()('datasets').where({ id: datasetId }).first('archived_at')).archived_at).toBeNull();
	});

	it('a signed-in outsider gets 404 for a real run exactly as for an invented one', async () => {
		const real = await answer(t.outsider.client, 'GET', `/api/v1/runs/${runs[0].id}/path`);
		const invented = await answer(t.outsider.client, 'GET', `/api/v1/runs/${randomUUID()}/path`);
		expect(real).toEqual(invented);
		expect(real.status).toBe(404);
	});
});

describe('run ids', () => {
	it('are random UUIDs, not a counter, and the internal sequence number does not open a path', async () => {
		expect(runs.length).toBe(8);
		for (const r of runs) expect(r.id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
		expect(new Set(runs.map((r) => r.id)).size).toBe(runs.length);
		const internal = await testDb()('study_runs').where({ study_id: studyId }).orderBy('id').first('id', 'public_id');
		expect(String(internal.public_id)).not.toBe(String(internal.id));
		const bySequence = await t.viewer.client.get(`/api/v1/runs/${internal.id}/path`);
		expect(bySequence.status).toBe(404);
		expect((await t.viewer.client.get(`/api/v1/runs/${internal.public_id}/path`)).status).toBe(200);
	});
});
