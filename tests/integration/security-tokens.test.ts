// A bearer token must not mint tokens or change the account through the pages'
// form actions (the API already refused; the settings form did not). Real server, real DB.
import { afterAll, describe, expect, it } from 'vitest';
import { Client, json, newUser, testDb } from './client';

afterAll(async () => {
	await testDb().destroy();
});

describe('API tokens reach only the API', () => {
	it('the settings form refuses a token: no child token is created, the name is unchanged', async () => {
		const { client, id: userId } = await newUser('mint');
		const { token } = await json<{ token: string }>(await client.post('/api/v1/tokens', { name: 'parent' }));
		const script = new Client();
		script.bearer = token;
		const before = await testDb()('api_tokens').where({ user_id: userId }).count<{ count: string }[]>('* as count');

		const mint = await script.form('/settings?/createToken', { name: 'child' });
		expect(mint.status).toBe(403);
		expect(await mint.text()).toMatch(/API tokens work only under \/api\//);
		const rename = await script.form('/settings?/profile', { name: 'Renamed By Token' });
		expect(rename.status).toBe(403);
		expect((await script.get('/settings')).status).toBe(403);

		const after = await testDb()('api_tokens').where({ user_id: userId }).count<{ count: string }[]>('* as count');
		expect(after[0].count).toBe(before[0].count);
		expect((await testDb()('users').where({ id: userId }).first()).name).not.toBe('Renamed By Token');
		// the token still works where it belongs
		expect((await script.get('/api/v1/workspaces')).status).toBe(200);
	});

	it('the same form action works from the signed-in session', async () => {
		const { client, id: userId } = await newUser('mint-ok');
		const r = await client.form('/settings?/createToken', { name: 'from-session' });
		expect(r.status).toBe(200);
		expect(await testDb()('api_tokens').where({ user_id: userId, name: 'from-session' }).first()).toBeDefined();
	});
});
