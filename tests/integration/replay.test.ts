// What the study page's replay fetches, signed in and through a share link,
// against the real server and database: a run's path and its fit's file (the
// replay rebuilds the fit in the browser for f′ and f″). Paths are never in
// the page data. Bad tokens and ids are a 4xx with the one error shape, never
// a 500; a run or fit of another study is a 404 through a link.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fitFromJSON } from '../../src/lib/numerics/fits/fitCurve';
import { Client, json, testDb } from './client';
import { dataset, launch, team, waitFor, type ErrorBody, type RunBody } from './studiesFixtures';
import { expectClose } from '../reference/tolerance';

afterAll(async () => {
	await testDb().destroy();
});

type Path = { x: (number | null)[][]; f: (number | null)[]; grad: (number | null)[][]; step: (number | null)[]; violation: (number | null)[] };

let t: Awaited<ReturnType<typeof team>>;
let studyId: string;
let otherStudyId: string;
let runs: RunBody[];
let otherRuns: RunBody[];
let token: string;
let fits: { id: string; method: string }[];
let otherFits: { id: string; method: string }[];

const STUDY = (datasetId: string, name: string) => ({
	name,
	datasetId,
	output: 'eta',
	problem: { kind: 'maximize' },
	fits: [{ method: 'linear' }, { method: 'akima' }, { method: 'pchip' }],
	optimizers: [{ method: 'sqp' }],
	starts: { latinHypercube: 5, seed: 11 }
});

beforeAll(async () => {
	t = await team('replay');
	const datasetId = await dataset(t.editor.client, t.ws.slug);
	studyId = await launch(t.editor.client, t.ws.slug, STUDY(datasetId, 'Replay, shared'));
	otherStudyId = await launch(t.editor.client, t.ws.slug, STUDY(datasetId, 'Replay, not shared'));
	const [a, b] = await Promise.all([waitFor(t.editor.client, studyId), waitFor(t.editor.client, otherStudyId)]);
	expect(a.status, a.error ?? '').toBe('done');
	expect(b.status, b.error ?? '').toBe('done');
	fits = a.fits;
	otherFits = b.fits;
	runs = (await json<{ runs: RunBody[] }>(await t.viewer.client.get(`/api/v1/studies/${studyId}/runs`))).runs;
	otherRuns = (await json<{ runs: RunBody[] }>(await t.viewer.client.get(`/api/v1/studies/${otherStudyId}/runs`))).runs;
	token = (await json<{ token: string }>(await t.owner.client.post(`/api/v1/studies/${studyId}/share`, {}))).token;
	expect(token).toBeTruthy();
}, 180_000);

/** The error shape every refusal has. */
async function refused(res: Response, status: number) {
	expect(res.status).toBe(status);
	const body = await json<ErrorBody>(res);
	expect(typeof body.error.code).toBe('string');
	expect(body.error.message.length).toBeGreaterThan(0);
}

describe('the replay reads paths and fit files', () => {
	it('a path through the link is the same path a member reads, and ends where the run says it ended', async () => {
		const anyone = new Client();
		for (const r of runs) {
			const member = await t.viewer.client.get(`/api/v1/runs/${r.id}/path`);
			const shared = await anyone.get(`/api/v1/shared/${token}/runs/${r.id}/path`);
			expect(member.status).toBe(200);
			expect(shared.status).toBe(200);
			const p = await json<Path>(shared);
			expect(p).toEqual(await json<Path>(member));
			// one row per iterate: the start and one per iteration (common practice, no source: what the optimizers record)
			expect(p.f).toHaveLength(r.iterations + 1);
			expect(p.x[0][0]).toBeCloseTo(r.start[0], 12);
			expect(p.x.at(-1)![0]).toBeCloseTo(r.x[0], 12);
		}
	});

	it('the fit file through the link rebuilds a fit that gives the path’s own f and f′ at every iterate', async () => {
		// an independent check of what the replay draws: the path's f and ∇f were recorded by the
		// optimizer during the run; here the fit is rebuilt from its exported file and evaluated again
		const anyone = new Client();
		for (const fit of fits) {
			const res = await anyone.get(`/api/v1/shared/${token}/fits/${fit.id}/export?format=json`);
			expect(res.status).toBe(200);
			const model = fitFromJSON((await json<{ fit: unknown }>(res)).fit);
			expect(model.method).toBe(fit.method);
			for (const r of runs.filter((x) => x.fitId === fit.id)) {
				const p = await json<Path>(await anyone.get(`/api/v1/shared/${token}/runs/${r.id}/path`));
				p.x.forEach((x, k) => {
					const j = model.evaluate(x[0]!);
					expectClose(p.f[k]!, j.f, 1e-12, `f at iterate ${k}`);
					expectClose(p.grad[k][0]!, j.df, 1e-12, `f′ at iterate ${k}`);
				});
			}
		}
	});

	it('linear stalls at a kink where its f′ really jumps, from most starts; Akima converges from every start', async () => {
		const linear = fits.find((f) => f.method === 'linear')!;
		const akima = fits.find((f) => f.method === 'akima')!;
		const linRuns = runs.filter((r) => r.fitId === linear.id);
		const stalled = linRuns.filter((r) => r.outcome === 'stalled' && r.atKink);
		expect(stalled.length).toBeGreaterThanOrEqual(3);
		// the table's knots are the data's x; the linear fit's slopes either side of the knot
		// come from the two neighbouring table rows (hand computation from the invented table)
		const model = fitFromJSON((await json<{ fit: unknown }>(await t.viewer.client.get(`/api/v1/studies/${studyId}/fits/${linear.id}/export?format=json`))).fit);
		for (const r of stalled) {
			const knot = model.knots.reduce((best, k) => (Math.abs(k - r.x[0]) < Math.abs(best - r.x[0]) ? k : best), model.knots[0]);
			expect(Math.abs(knot - r.x[0])).toBeLessThan(1e-6);
			expect(knot).toBe(0.9);
			const left = (0.86 - 0.83) / (0.9 - 0.7);
			const right = (0.8 - 0.86) / (1.1 - 0.9);
			expectClose(model.evaluate(knot - 1e-9).df, left, 1e-9);
			expectClose(model.evaluate(knot + 1e-9).df, right, 1e-9);
			// a maximum on a corner: rising on the left, falling on the right
			expect(left).toBeGreaterThan(0);
			expect(right).toBeLessThan(0);
		}
		const akRuns = runs.filter((r) => r.fitId === akima.id);
		expect(akRuns.every((r) => r.outcome === 'converged')).toBe(true);
		// converged checked independently: f′ of the rebuilt fit is ~0 at every end point
		const ak = fitFromJSON((await json<{ fit: unknown }>(await t.viewer.client.get(`/api/v1/studies/${studyId}/fits/${akima.id}/export?format=json`))).fit);
		for (const r of akRuns) expect(Math.abs(ak.evaluate(r.x[0]).df)).toBeLessThan(1e-5);
	});

	it('the shared page and the study page carry no paths in their data', async () => {
		const anyone = new Client();
		const shared = await anyone.get(`/shared/${token}/__data.json`);
		expect(shared.status).toBe(200);
		const text = await shared.text();
		expect(text).not.toMatch(/"grad"|"violation"/);
		const member = await t.viewer.client.get(`/w/${t.ws.slug}/studies/${studyId}/__data.json`);
		expect(member.status).toBe(200);
		expect(await member.text()).not.toMatch(/"grad"|"violation"/);
	});
});

describe('bad tokens and ids are a 4xx, never a 500', () => {
	const BAD_TOKENS = ['x', 'not-a-token', 'a'.repeat(43), 'A'.repeat(500), '%00', '..%2F..', "'%20OR%201=1--", '%E2%98%83', ''];
	const BAD_IDS = ['1', 'not-a-uuid', '00000000-0000-0000-0000-000000000000', '123e4567-e89b-12d3-a456-42661417400', "'%20OR%201=1--", '%E2%98%83', 'A'.repeat(400)];

	it('a bad token, on a real run, is a 404 for the path and the fit file', async () => {
		const anyone = new Client();
		for (const bad of BAD_TOKENS) {
			const path = await anyone.get(`/api/v1/shared/${bad}/runs/${runs[0].id}/path`);
			const fit = await anyone.get(`/api/v1/shared/${bad}/fits/${fits[0].id}/export?format=json`);
			for (const res of [path, fit]) {
				expect(res.status, `token ${JSON.stringify(bad)}`).toBeGreaterThanOrEqual(400);
				expect(res.status, `token ${JSON.stringify(bad)}`).toBeLessThan(500);
			}
			if (bad) {
				await refused(path, 404);
				await refused(fit, 404);
			}
		}
	});

	it('a bad run id through a good token is a 404', async () => {
		const anyone = new Client();
		for (const bad of BAD_IDS) await refused(await anyone.get(`/api/v1/shared/${token}/runs/${bad}/path`), 404);
	});

	it('a run or a fit of another study is a 404 through the link, though the same member reads it', async () => {
		const anyone = new Client();
		expect((await t.viewer.client.get(`/api/v1/runs/${otherRuns[0].id}/path`)).status).toBe(200);
		for (const r of otherRuns.slice(0, 3)) await refused(await anyone.get(`/api/v1/shared/${token}/runs/${r.id}/path`), 404);
		for (const f of otherFits) await refused(await anyone.get(`/api/v1/shared/${token}/fits/${f.id}/export?format=json`), 404);
	});

	it('signed out, a member path is a 401 for real and made-up ids alike; an outsider gets 404', async () => {
		const anyone = new Client();
		await refused(await anyone.get(`/api/v1/runs/${runs[0].id}/path`), 401);
		await refused(await anyone.get(`/api/v1/runs/00000000-0000-0000-0000-000000000000/path`), 401);
		await refused(await t.outsider.client.get(`/api/v1/runs/${runs[0].id}/path`), 404);
	});

	it('a revoked link stops serving paths and fit files at once', async () => {
		const again = (await json<{ token: string }>(await t.owner.client.post(`/api/v1/studies/${studyId}/share`, {}))).token;
		const anyone = new Client();
		expect((await anyone.get(`/api/v1/shared/${again}/runs/${runs[0].id}/path`)).status).toBe(200);
		// the old link was replaced by the new one
		await refused(await anyone.get(`/api/v1/shared/${token}/runs/${runs[0].id}/path`), 404);
		expect((await t.owner.client.del(`/api/v1/studies/${studyId}/share`)).status).toBe(204);
		await refused(await anyone.get(`/api/v1/shared/${again}/runs/${runs[0].id}/path`), 404);
		await refused(await anyone.get(`/api/v1/shared/${again}/fits/${fits[0].id}/export?format=json`), 404);
	});
});
