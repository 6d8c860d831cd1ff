// Studies through the API against the real server, database and job queue:
// launch, runs and paths, scorecard, progress events, pick, share links, roles.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { Client, caughtMail, json, testDb } from './client';
import { dataset, launch, team, waitFor, type ErrorBody, type RunBody, type StudyBody } from './studiesFixtures';

afterAll(async () => {
	await testDb().destroy();
});

let t: Awaited<ReturnType<typeof team>>;
let datasetId: string;
let studyId: string;
let study: StudyBody;
let runs: RunBody[];

const FOUR_BY_TWO = () => ({
	name: 'Peak efficiency, four fits',
	datasetId,
	output: 'eta',
	problem: { kind: 'maximize' },
	fits: [{ method: 'linear' }, { method: 'pchip' }, { method: 'akima' }, { method: 'cubic-natural' }],
	optimizers: [{ method: 'sqp' }, { method: 'bfgs' }],
	starts: { latinHypercube: 10, seed: 3 }
});

beforeAll(async () => {
	t = await team('study');
	datasetId = await dataset(t.editor.client, t.ws.slug);
	studyId = await launch(t.editor.client, t.ws.slug, FOUR_BY_TWO());
	study = await waitFor(t.editor.client, studyId);
	runs = (await json<{ runs: RunBody[] }>(await t.editor.client.get(`/api/v1/studies/${studyId}/runs`))).runs;
});

describe('a study of 4 fits × 2 optimizers × 10 starts on a coarse curve', () => {
	it('finishes with every run stored exactly once', async () => {
		expect(study.status, study.error ?? '').toBe('done');
		expect(study.progress).toEqual({ done: 80, total: 80 });
		expect(runs).toHaveLength(80);
		const keys = new Set(runs.map((r) => `${r.fitId}/${r.optimizer}/${r.start[0]}`));
		expect(keys.size).toBe(80);
		const [{ n, distinct }] = (
			await testDb().raw(`SELECT count(*)::int AS n, count(DISTINCT (fit_id, optimizer, start_index))::int AS distinct FROM study_runs WHERE study_id = ?`, [studyId])
		).rows;
		expect({ n, distinct }).toEqual({ n: 80, distinct: 80 });
	});

	it('answers runs in the documented shape', () => {
		for (const r of runs) {
			expect(Object.keys(r)).toEqual(expect.arrayContaining(['id', 'fitId', 'method', 'optimizer', 'start', 'outcome', 'atKink', 'iterations', 'evaluations', 'x', 'f', 'gradNorm', 'ms']));
			expect(['converged', 'stalled', 'iteration-limit', 'left-domain', 'diverged']).toContain(r.outcome);
			expect(r.start[0]).toBeGreaterThanOrEqual(0.1);
			expect(r.start[0]).toBeLessThanOrEqual(1.5);
			expect(typeof r.evaluations.f).toBe('number');
			expect(typeof r.evaluations.grad).toBe('number');
		}
	});

	it('linear fits stall at the kink; smooth fits converge', () => {
		const of = (m: string) => runs.filter((r) => r.method === m);
		const linear = of('linear');
		expect(linear.filter((r) => r.outcome === 'converged')).toHaveLength(0);
		expect(linear.filter((r) => r.outcome === 'stalled' && r.atKink).length).toBeGreaterThanOrEqual(linear.length / 2);
		for (const m of ['pchip', 'akima', 'cubic-natural']) {
			const ok = of(m).filter((r) => r.outcome === 'converged');
			expect(ok.length, m).toBe(of(m).length);
		}
	});

	it('brings back each run’s whole path', async () => {
		for (const r of [runs[0], runs.find((x) => x.method === 'linear')!, runs.at(-1)!]) {
			const res = await t.viewer.client.get(`/api/v1/runs/${r.id}/path`);
			expect(res.status).toBe(200);
			const p = await json<{ x: number[][]; f: number[]; grad: number[][]; step: number[]; violation: number[] }>(res);
			const L = p.f.length;
			expect(L).toBe(r.iterations + 1);
			for (const col of [p.x, p.grad, p.step, p.violation]) expect(col).toHaveLength(L);
			expect(p.x[0][0]).toBeCloseTo(r.start[0], 12);
			expect(p.x[L - 1][0]).toBeCloseTo(r.x[0], 12);
			expect(p.step[0]).toBe(0);
		}
	});

	it('scores every fit × optimizer, ranks the linear fit last, and states the reference optimum', () => {
		expect(study.scorecard).toHaveLength(8);
		const row = study.scorecard[0];
		expect(Object.keys(row)).toEqual(expect.arrayContaining(['fitId', 'method', 'optimizer', 'runs', 'successRate', 'medianIterations', 'medianEvaluations', 'best']));
		expect(study.scorecard.map((r) => r.rank)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
		expect(study.scorecard.slice(-2).map((r) => r.method)).toEqual(['linear', 'linear']);
		for (const r of study.scorecard.filter((s) => s.method !== 'linear')) {
			expect(r.successRate).toBe(1);
			expect(r.reachesReference).toBe(true);
		}
		for (const f of study.fits) {
			expect(f.reference?.x?.length).toBe(1);
			expect(typeof f.fidelity?.looRmse).toBe('number');
			expect(f.continuity.measured).toBeTruthy();
		}
		expect(study.fits.find((f) => f.method === 'linear')!.continuity.measured).toBe('C0');
	});

	it('e-mails the launcher that the study finished', async () => {
		const mail = await caughtMail(t.editor.email);
		expect(mail.subject).toBe('Study finished: Peak efficiency, four fits');
		expect(mail.text).toContain(`/w/${t.ws.slug}/studies/${studyId}`);
	});

	it('lists the study in its workspace', async () => {
		const r = await t.viewer.client.get(`/api/v1/workspaces/${t.ws.slug}/studies`);
		const { studies } = await json<{ studies: { id: string; name: string; status: string; createdAt: string }[] }>(r);
		expect(studies.find((s) => s.id === studyId)).toMatchObject({ name: 'Peak efficiency, four fits', status: 'done' });
		const page = await t.viewer.client.get(`/w/${t.ws.slug}`);
		expect(await page.text()).toContain('Peak efficiency, four fits');
	});

	it('serves the study page with the scorecard, the rank rule and the caution, and its data compactly', async () => {
		const page = await t.viewer.client.get(`/w/${t.ws.slug}/studies/${studyId}`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Scorecard');
		expect(html).toContain('How rows are ranked.');
		expect(html).toContain('decision aids computed from your data');
		const t0 = Date.now();
		const data = await t.viewer.client.get(`/w/${t.ws.slug}/studies/${studyId}/__data.json`);
		const body = await data.text();
		expect(data.status).toBe(200);
		expect(Date.now() - t0).toBeLessThan(2000);
		expect(body.length).toBeLessThan(200_000);
		expect(body).not.toContain('"path"');
	});
});

describe('progress events', () => {
	it('stream progress while a study runs and end when it is done', async () => {
		const id = await launch(t.editor.client, t.ws.slug, { ...FOUR_BY_TWO(), name: 'Events', starts: { latinHypercube: 300, seed: 9 } });
		const res = await t.viewer.client.get(`/api/v1/studies/${id}/events`);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toContain('text/event-stream');
		const text = await res.text(); // the server closes the stream after `end`
		const events = [...text.matchAll(/event: (\w+)\ndata: (.*)\n/g)].map((m) => ({ event: m[1], data: JSON.parse(m[2]) }));
		const progress = events.filter((e) => e.event === 'progress');
		expect(progress.length).toBeGreaterThanOrEqual(2);
		const done = progress.map((e) => e.data.done as number);
		expect([...done].sort((a, b) => a - b)).toEqual(done);
		expect(events.at(-1)).toMatchObject({ event: 'end', data: { status: 'done', done: 2400, total: 2400 } });
	});
});

describe('pick', () => {
	it('editors pick a fit with a rationale; who and when are recorded', async () => {
		const pchip = study.fits.find((f) => f.method === 'pchip')!;
		const r = await t.editor.client.post(`/api/v1/studies/${studyId}/pick`, { fitId: pchip.id, rationale: 'Converges from every start with SQP and BFGS; C1 and monotone.' });
		expect(r.status).toBe(200);
		const s = await waitFor(t.viewer.client, studyId);
		expect(s.pick).toMatchObject({ fitId: pchip.id, rationale: 'Converges from every start with SQP and BFGS; C1 and monotone.', by: 'Test study-editor' });
		expect(Date.now() - new Date(s.pick!.at).getTime()).toBeLessThan(60_000);
	});

	it('refuses viewers, fits of other studies and empty rationales', async () => {
		const fitId = study.fits[0].id;
		expect((await t.viewer.client.post(`/api/v1/studies/${studyId}/pick`, { fitId, rationale: 'viewers cannot pick' })).status).toBe(403);
		const other = await t.editor.client.post(`/api/v1/studies/${studyId}/pick`, { fitId: '00000000-0000-4000-8000-000000000000', rationale: 'a fit that is not here' });
		expect(other.status).toBe(422);
		expect((await json<ErrorBody>(other)).error.details?.[0].field).toBe('fitId');
		const empty = await t.editor.client.post(`/api/v1/studies/${studyId}/pick`, { fitId, rationale: '' });
		expect(empty.status).toBe(422);
		expect((await json<ErrorBody>(empty)).error.details?.[0].field).toBe('rationale');
	});
});

describe('share links', () => {
	it('owners make a link that opens the study for anyone, stored hashed; revoking stops it on the next request', async () => {
		expect((await t.editor.client.post(`/api/v1/studies/${studyId}/share`)).status).toBe(403);
		const r = await t.owner.client.post(`/api/v1/studies/${studyId}/share`);
		expect(r.status).toBe(201);
		const { token, url } = await json<{ token: string; url: string }>(r);
		expect(Buffer.from(token, 'base64url').length).toBeGreaterThanOrEqual(16);
		expect(url).toMatch(new RegExp(`/shared/${token}$`));
		const row = await testDb()('study_shares').where({ study_id: studyId }).whereNull('revoked_at').first('token_hash');
		expect(row.token_hash).toBe(createHash('sha256').update(token).digest('hex'));

		const anyone = new Client();
		const shared = await anyone.get(`/api/v1/shared/${token}`);
		expect(shared.status).toBe(200);
		const body = await json<StudyBody>(shared);
		expect(body).toMatchObject({ id: studyId, status: 'done', progress: { done: 80, total: 80 } });
		expect(body.scorecard).toHaveLength(8);
		const page = await anyone.get(`/shared/${token}`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Peak efficiency, four fits');
		expect(html).toContain('decision aids computed from your data');
		const sharedRuns = await json<{ runs: RunBody[] }>(await anyone.get(`/api/v1/shared/${token}/runs`));
		expect(sharedRuns.runs).toHaveLength(80);
		expect((await anyone.get(`/api/v1/shared/${token}/runs/${sharedRuns.runs[0].id}/path`)).status).toBe(200);
		// a run of another study is not reachable through this link
		// (the demo studies from the seeds always provide one)
		const otherRun = await testDb()('study_runs').whereNot({ study_id: studyId }).first('public_id');
		expect(otherRun).toBeDefined();
		expect((await anyone.get(`/api/v1/shared/${token}/runs/${otherRun.public_id}/path`)).status).toBe(404);

		expect((await t.owner.client.del(`/api/v1/studies/${studyId}/share`)).status).toBe(204);
		expect((await anyone.get(`/api/v1/shared/${token}`)).status).toBe(404);
		expect((await anyone.get(`/shared/${token}`)).status).toBe(404);
	});

	it('a link with an expiry stops working when it expires', async () => {
		const r = await t.owner.client.post(`/api/v1/studies/${studyId}/share`, { expiresInDays: 7 });
		const { token } = await json<{ token: string }>(r);
		const anyone = new Client();
		expect((await anyone.get(`/api/v1/shared/${token}`)).status).toBe(200);
		await testDb()('study_shares').where({ token_hash: createHash('sha256').update(token).digest('hex') }).update({ expires_at: testDb().raw(`now() - interval '1 second'`) });
		expect((await anyone.get(`/api/v1/shared/${token}`)).status).toBe(404);
		expect((await anyone.get(`/api/v1/shared/not-a-token-${'x'.repeat(30)}`)).status).toBe(404);
	});
});

describe('who may see a study', () => {
	it('outsiders get 404 for the study, its runs, its paths, its events and its page', async () => {
		const c = t.outsider.client;
		for (const path of [`/api/v1/studies/${studyId}`, `/api/v1/studies/${studyId}/runs`, `/api/v1/runs/${runs[0].id}/path`, `/api/v1/studies/${studyId}/events`, `/w/${t.ws.slug}/studies/${studyId}`]) {
			const r = await c.get(path);
			expect(r.status, path).toBe(404);
		}
		expect((await new Client().get(`/api/v1/studies/${studyId}`)).status).toBe(401);
	});

	it('viewers read but may not cancel; a finished study cannot be cancelled', async () => {
		expect((await t.viewer.client.get(`/api/v1/studies/${studyId}`)).status).toBe(200);
		expect((await t.viewer.client.post(`/api/v1/studies/${studyId}/cancel`)).status).toBe(403);
		const r = await t.editor.client.post(`/api/v1/studies/${studyId}/cancel`);
		expect(r.status).toBe(409);
		expect((await json<ErrorBody>(r)).error.message).toMatch(/already ended \(done\)/);
	});
});

describe('the new-study form', () => {
	it('launches a study without JavaScript and redirects to it', async () => {
		const r = await t.editor.client.form(`/w/${t.ws.slug}/studies/new`, {
			source: `${datasetId}:eta`,
			kind: 'maximize',
			'fit.pchip': 'on',
			'fit.softened-linear': 'on',
			'opt.sqp': 'on',
			startsKind: 'points',
			startsPoints: '0.2, 0.6, 1.2',
			extrapolation: 'refuse'
		});
		expect(r.status).toBe(303);
		const location = r.headers.get('location')!;
		expect(location).toMatch(new RegExp(`^/w/${t.ws.slug}/studies/[0-9a-f-]{36}$`));
		const s = await waitFor(t.editor.client, location.split('/').pop()!);
		expect(s.status).toBe('done');
		expect(s.progress.total).toBe(6);
	});

	it('shows the same messages as the API when the form is wrong, and stores nothing', async () => {
		const before = await testDb()('studies').where({ workspace_id: t.ws.id }).count<{ n: number }[]>('* as n');
		const r = await t.editor.client.form(`/w/${t.ws.slug}/studies/new`, {
			source: `${datasetId}:eta`,
			kind: 'solve',
			'opt.sqp': 'on',
			startsKind: 'grid',
			startsCount: '0'
		});
		expect(r.status).toBe(422);
		const html = await r.text();
		expect(html).toContain('a solve problem needs a target');
		expect(html).toContain('choose at least one fit');
		expect(html).toContain('grid (starts per input) must be at least 1');
		const after = await testDb()('studies').where({ workspace_id: t.ws.id }).count<{ n: number }[]>('* as n');
		expect(after[0].n).toBe(before[0].n);
	});

	it('is for editors: viewers get 403', async () => {
		expect((await t.viewer.client.get(`/w/${t.ws.slug}/studies/new`)).status).toBe(403);
	});
});
