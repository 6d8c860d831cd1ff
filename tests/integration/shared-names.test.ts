// Member names behind a share link, against the real server and database: a
// link holder sees no name or e-mail of the team (who launched the study, who
// picked its fit) unless an owner chose to show them on that link; viewers
// and editors cannot choose it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, json, testDb } from './client';
import { dataset, launch, team, waitFor, type ErrorBody, type StudyBody } from './studiesFixtures';

afterAll(async () => {
	await testDb().destroy();
});

let t: Awaited<ReturnType<typeof team>>;
let studyId: string;
let token: string;
const anyone = new Client();
// sign-up names are `Test <tag>` (see newUser)
const names = { owner: 'Test sn-owner', editor: 'Test sn-editor' };

/** Every page and API a link holder can reach, as text. */
async function everythingShared(): Promise<Record<string, string>> {
	const paths = [`/api/v1/shared/${token}`, `/shared/${token}`, `/shared/${token}/__data.json`, `/shared/${token}/record`, `/api/v1/shared/${token}/runs`];
	const out: Record<string, string> = {};
	for (const p of paths) {
		const r = await anyone.get(p);
		expect(r.status, p).toBe(200);
		out[p] = await r.text();
	}
	const { fits } = JSON.parse(out[`/api/v1/shared/${token}`]) as StudyBody;
	const exp = await anyone.get(`/api/v1/shared/${token}/fits/${fits[0].id}/export?format=json`);
	expect(exp.status).toBe(200);
	out.export = await exp.text();
	return out;
}

function leaks(texts: Record<string, string>): string[] {
	const found: string[] = [];
	for (const [where, text] of Object.entries(texts)) {
		for (const word of [names.owner, names.editor, t.owner.email, t.editor.email, t.owner.id, t.editor.id]) {
			if (text.includes(word)) found.push(`${where} contains ${word}`);
		}
	}
	return found;
}

beforeAll(async () => {
	t = await team('sn');
	const datasetId = await dataset(t.editor.client, t.ws.slug);
	studyId = await launch(t.editor.client, t.ws.slug, {
		name: 'Names on shared links',
		datasetId,
		output: 'eta',
		problem: { kind: 'maximize' },
		fits: [{ method: 'pchip' }],
		optimizers: [{ method: 'sqp' }],
		starts: { latinHypercube: 3, seed: 1 }
	});
	const s = await waitFor(t.editor.client, studyId);
	expect(s.status, s.error ?? '').toBe('done');
	const pick = await t.editor.client.post(`/api/v1/studies/${studyId}/pick`, { fitId: s.fits[0].id, rationale: 'Converges from every start.' });
	expect(pick.status).toBe(200);
	const r = await t.owner.client.post(`/api/v1/studies/${studyId}/share`);
	expect(r.status).toBe(201);
	const body = await json<{ token: string; showNames: boolean }>(r);
	expect(body.showNames).toBe(false);
	token = body.token;
});

describe('member names on a share link', () => {
	it('members still see who launched and who picked', async () => {
		const s = await json<StudyBody>(await t.viewer.client.get(`/api/v1/studies/${studyId}`));
		expect(s.pick?.by).toBe(names.editor);
		const page = await (await t.viewer.client.get(`/w/${t.ws.slug}/studies/${studyId}`)).text();
		expect(page).toContain(names.editor);
	});

	it('are hidden by default from every page and API behind the token', async () => {
		const shared = await everythingShared();
		expect(leaks(shared)).toEqual([]);
		const body = JSON.parse(shared[`/api/v1/shared/${token}`]) as StudyBody;
		expect(body.pick).toMatchObject({ rationale: 'Converges from every start.', by: null });
		// the study itself is all there
		expect(shared[`/shared/${token}`]).toContain('Names on shared links');
		expect(shared[`/shared/${token}`]).toContain('Converges from every start.');
	});

	it('viewers and editors cannot show them (403), and nothing changes', async () => {
		for (const who of [t.viewer, t.editor]) {
			const r = await who.client.patch(`/api/v1/studies/${studyId}/share`, { showNames: true });
			expect(r.status).toBe(403);
			const f = await who.client.form(`/w/${t.ws.slug}/studies/${studyId}?/shareNames`, { showNames: 'true' });
			expect(f.status).toBe(403);
		}
		expect((await t.outsider.client.patch(`/api/v1/studies/${studyId}/share`, { showNames: true })).status).toBe(404);
		expect((await anyone.patch(`/api/v1/studies/${studyId}/share`, { showNames: true })).status).toBe(401);
		expect(leaks(await everythingShared())).toEqual([]);
		const row = await testDb()('study_shares').where({ study_id: studyId }).whereNull('revoked_at').first('show_names');
		expect(row.show_names).toBe(false);
	});

	it('refuses a value that is not true or false, naming the field', async () => {
		const r = await t.owner.client.patch(`/api/v1/studies/${studyId}/share`, { showNames: 'yes' });
		expect(r.status).toBe(422);
		const body = await json<ErrorBody>(r);
		expect(body.error.details?.[0]).toMatchObject({ field: 'showNames', problem: 'showNames must be true or false' });
	});

	it('appear once the owner shows them, and hide again', async () => {
		const r = await t.owner.client.patch(`/api/v1/studies/${studyId}/share`, { showNames: true });
		expect(r.status).toBe(200);
		expect(await json(r)).toEqual({ showNames: true });
		const shown = await everythingShared();
		expect((JSON.parse(shown[`/api/v1/shared/${token}`]) as StudyBody).pick?.by).toBe(names.editor);
		expect(shown[`/shared/${token}`]).toContain(names.editor);
		expect(shown[`/shared/${token}/record`]).toContain(names.editor);
		// e-mails and ids are never part of a shared view
		for (const text of Object.values(shown)) {
			for (const word of [t.owner.email, t.editor.email, t.editor.id]) expect(text).not.toContain(word);
		}

		const f = await t.owner.client.form(`/w/${t.ws.slug}/studies/${studyId}?/shareNames`, { showNames: 'false' });
		expect(f.status).toBeLessThan(400);
		expect(leaks(await everythingShared())).toEqual([]);
	});

	it('a new link made with showNames shows them; a new link without it hides them again', async () => {
		const withNames = await json<{ token: string; showNames: boolean }>(await t.owner.client.post(`/api/v1/studies/${studyId}/share`, { showNames: true }));
		expect(withNames.showNames).toBe(true);
		token = withNames.token;
		expect((await json<StudyBody>(await anyone.get(`/api/v1/shared/${token}`))).pick?.by).toBe(names.editor);
		token = (await json<{ token: string }>(await t.owner.client.post(`/api/v1/studies/${studyId}/share`, {}))).token;
		expect(leaks(await everythingShared())).toEqual([]);
	});

	it('answers 404 when the study has no live link', async () => {
		expect((await t.owner.client.del(`/api/v1/studies/${studyId}/share`)).status).toBe(204);
		const r = await t.owner.client.patch(`/api/v1/studies/${studyId}/share`, { showNames: true });
		expect(r.status).toBe(404);
		expect((await json<ErrorBody>(r)).error.message).toContain('no live share link');
	});
});
