// NUL and other control characters in any text field, slug or id answer 4xx
// naming the field, never 500 (PostgreSQL text cannot hold NUL); ids must be
// real UUIDs before they reach the database. Nothing is stored on refusal.
import { afterAll, describe, expect, it } from 'vitest';
import { Client, json, newUser, newWorkspace, testDb, uniqueEmail } from './client';
import { upload, type ErrorBody } from './datasetHelpers';

afterAll(async () => {
	await testDb().destroy();
});

const DASHES = '-'.repeat(36);

describe('control characters are refused with 4xx naming the field', () => {
	it('JSON bodies: sign-up name, workspace name, token name, a nested study field', async () => {
		const email = uniqueEmail('nul');
		const r = await new Client().post('/api/v1/users', { email, password: 'long-enough-pw', name: 'Ada\u0000Lovelace' });
		expect(r.status).toBe(422);
		const body = await json<ErrorBody>(r);
		expect(body.error.details?.[0].field).toBe('name');
		expect(body.error.message).toMatch(/control character \(U\+0000 at character 4\)/);
		expect(await testDb()('users').where({ email }).first()).toBeUndefined();

		const { client } = await newUser('nul-ws');
		const w = await client.post('/api/v1/workspaces', { name: 'Wing\u0000' });
		expect(w.status).toBe(422);
		expect((await json<ErrorBody>(w)).error.details?.[0].field).toBe('name');
		const tok = await client.post('/api/v1/tokens', { name: 'bell\u0007' });
		expect(tok.status).toBe(422);
		const ws = await newWorkspace(client, 'Control Chars');
		const st = await client.post(`/api/v1/workspaces/${ws.slug}/studies`, { name: 'ok', problem: { constraints: [{ output: 'a\u0000b' }] } });
		expect(st.status).toBe(422);
		expect((await json<ErrorBody>(st)).error.details?.[0].field).toBe('problem.constraints.0.output');
	});

	it('form actions: the settings profile name', async () => {
		const { client, id } = await newUser('nul-form');
		const r = await client.form('/settings?/profile', { name: 'Bad\u0000Name' });
		expect(r.status).toBe(422);
		expect(await r.text()).toMatch(/control character/);
		expect((await testDb()('users').where({ id }).first()).name).not.toContain('\u0000');
	});

	it('uploads: a NUL in the name field or in a column header', async () => {
		const { client } = await newUser('nul-up');
		const ws = await newWorkspace(client, 'Control Uploads');
		const a = await upload(client, ws.slug, 'x,y\n1,2\n2,3\n', 'a.csv', { name: 'Sweep\u0000' });
		expect(a.status).toBe(422);
		expect((await json<ErrorBody>(a)).error.details?.[0].field).toBe('name');
		// a NUL byte makes the file binary (refused as not a text table); another control character reaches the header check
		const nul = await upload(client, ws.slug, 'x,y\u0000z\n1,2\n2,3\n', 'nul.csv');
		expect(nul.status).toBe(422);
		expect((await json<ErrorBody>(nul)).error.message).toMatch(/not a text table/);
		const rows = Array.from({ length: 60 }, (_, i) => `${i},${i * i}`).join('\n');
		const b = await upload(client, ws.slug, `x,y\u001bz\n${rows}\n`, 'b.csv');
		expect(b.status).toBe(422);
		const bb = await json<ErrorBody>(b);
		expect(bb.error.message).toMatch(/header contains a control character \(U\+001B at character 2\)/);
		expect(bb.error.details?.[0].row).toBe(1);
		expect(await testDb()('datasets').where({ workspace_id: ws.id }).first()).toBeUndefined();
	});

	it('slugs and ids: %00 in a path, 36 dashes as an id → 404; as a body id → 422 naming it', async () => {
		const { client } = await newUser('nul-id');
		const ws = await newWorkspace(client, 'Id Checks');
		expect((await client.get(`/api/v1/workspaces/${ws.slug}%00/datasets`)).status).toBe(404);
		expect((await client.get(`/w/${ws.slug}%00`)).status).toBe(404);
		for (const path of [`/api/v1/datasets/${DASHES}`, `/api/v1/studies/${DASHES}`, `/api/v1/runs/${DASHES}/path`]) {
			const r = await client.get(path);
			expect(r.status, path).toBe(404);
			expect((await json<ErrorBody>(r)).error.code).toBe('not-found');
		}
		expect((await client.del(`/api/v1/tokens/${DASHES}`)).status).toBe(404);
		const st = await client.post(`/api/v1/workspaces/${ws.slug}/studies`, { name: 'x', datasetId: DASHES });
		expect(st.status).toBe(422);
		expect((await json<ErrorBody>(st)).error.details?.some((d) => d.field === 'datasetId')).toBe(true);
	});
});
