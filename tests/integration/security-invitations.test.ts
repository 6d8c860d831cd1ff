import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, json, secondServer, testDb, uniqueEmail } from './client';

type ErrorBody = { error: { code: string; message: string; details?: { field?: string; problem: string }[] } };

// Invitations are mail sent in our name to any address: limited per address, per
// workspace and per sender, counted exactly even when sent in parallel. A second
// server with small limits (workspace 6 a day, sender 4 an hour).
let server: { base: string; stop: () => void };
beforeAll(async () => {
	server = await secondServer({ KINKLESS_INVITE_LIMIT_WORKSPACE: '6', KINKLESS_INVITE_LIMIT_SENDER: '4' });
}, 30_000);
afterAll(() => server?.stop());

async function owner(tag: string) {
	const c = new Client(server.base);
	const email = uniqueEmail(tag);
	expect((await c.post('/api/v1/users', { email, password: 'correct-horse-battery', name: tag })).status).toBe(201);
	expect((await c.post('/api/v1/session', { email, password: 'correct-horse-battery' })).status).toBe(200);
	const ws = await json<{ id: string; slug: string }>(await c.post('/api/v1/workspaces', { name: `Invites ${tag}` }));
	return { c, ws, email };
}
const invite = (c: Client, slug: string, email = uniqueEmail('invitee')) => c.post(`/api/v1/workspaces/${slug}/invitations`, { email, role: 'viewer' });
const stored = async (workspaceId: string) => Number((await testDb()('invitations').where({ workspace_id: workspaceId }).count<{ n: string }[]>('* as n'))[0].n);

describe('invitation limits', () => {
	it('one address gets at most 3 invitations a day from a workspace; the 4th names the field and stores nothing', async () => {
		const { c, ws } = await owner('per-address');
		const to = uniqueEmail('resend');
		for (let i = 0; i < 3; i++) expect((await invite(c, ws.slug, to)).status).toBe(201);
		const r = await invite(c, ws.slug, to);
		expect(r.status).toBe(429);
		const body = await json<ErrorBody>(r);
		expect(body.error.code).toBe('too-many-invitations');
		expect(body.error.details?.[0]).toMatchObject({ field: 'email' });
		expect(body.error.message).toContain('3 times today');
		expect(await stored(ws.id)).toBe(3);
	});

	it('one sender sends at most 4 an hour, across workspaces, even 10 at once', async () => {
		const { c, ws } = await owner('per-sender');
		const second = await json<{ id: string; slug: string }>(await c.post('/api/v1/workspaces', { name: 'Second workspace' }));
		const statuses = await Promise.all(Array.from({ length: 10 }, (_, i) => invite(c, i % 2 ? ws.slug : second.slug).then((r) => r.status)));
		expect(statuses.filter((s) => s === 201)).toHaveLength(4);
		expect(statuses.filter((s) => s === 429)).toHaveLength(6);
		expect((await stored(ws.id)) + (await stored(second.id))).toBe(4);
		const r = await invite(c, ws.slug);
		expect((await json<ErrorBody>(r)).error.message).toMatch(/you have sent 4 invitations in the last hour/);
	});

	it('a workspace sends at most 6 a day, whoever of its owners sends them; the form says so too', async () => {
		const a = await owner('per-workspace');
		const b = await owner('co-owner');
		await testDb()('memberships').insert({ workspace_id: a.ws.id, user_id: (await testDb()('users').where({ email: b.email }).first('id')).id, role: 'owner' });
		for (let i = 0; i < 4; i++) expect((await invite(a.c, a.ws.slug)).status).toBe(201);
		for (let i = 0; i < 2; i++) expect((await invite(b.c, a.ws.slug)).status).toBe(201);
		const r = await invite(b.c, a.ws.slug);
		expect(r.status).toBe(429);
		expect((await json<ErrorBody>(r)).error.message).toMatch(/this workspace has sent 6 invitations in the last 24 hours/);
		const form = await b.c.form(`/w/${a.ws.slug}?/invite`, { email: uniqueEmail('form'), role: 'viewer' });
		expect(form.status).toBe(429);
		expect(await form.text()).toContain('this workspace has sent 6 invitations');
		expect(await stored(a.ws.id)).toBe(6);
	});
});
