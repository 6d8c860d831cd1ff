import { afterAll, describe, expect, it } from 'vitest';
import { caughtMail, Client, json, linkIn, newUser, newWorkspace, testDb } from './client';

type ErrorBody = { error: { code: string; message: string } };

afterAll(async () => {
	await testDb().destroy();
});

async function inviteAndAccept(owner: Client, slug: string, role: 'viewer' | 'editor' | 'owner') {
	const member = await newUser(role);
	const r = await owner.post(`/api/v1/workspaces/${slug}/invitations`, { email: member.email, role });
	expect(r.status).toBe(201);
	const { token } = linkIn((await caughtMail(member.email)).text, '/invite');
	const accept = await member.client.form(`/invite/${token}`, {});
	expect(accept.status).toBe(303);
	expect(accept.headers.get('location')).toBe(`/w/${slug}`);
	return { ...member, token };
}

describe('workspaces', () => {
	it('the creator becomes owner; slugs are unique', async () => {
		const { client } = await newUser('ws');
		const a = await newWorkspace(client, 'Propulsion Team');
		const b = await newWorkspace(client, 'Propulsion Team');
		expect(a.slug).toBe(a.slug.toLowerCase());
		expect(b.slug).not.toBe(a.slug);
		const list = await json<{ workspaces: { slug: string; role: string }[] }>(await client.get('/api/v1/workspaces'));
		expect(list.workspaces.map((w) => w.role)).toEqual(['owner', 'owner']);
	});

	it('rejects a one-letter workspace name with 422 naming the field', async () => {
		const { client } = await newUser('wsbad');
		const r = await client.post('/api/v1/workspaces', { name: 'x' });
		expect(r.status).toBe(422);
		expect(await r.text()).toContain('"field":"name"');
	});

	it('an outsider gets 404 for the workspace page and API, so existence does not leak', async () => {
		const { client: owner } = await newUser('owner');
		const ws = await newWorkspace(owner, 'Secret Wing');
		const { client: outsider } = await newUser('outsider');
		expect((await outsider.get(`/w/${ws.slug}`)).status).toBe(404);
		expect((await outsider.get(`/w/no-such-workspace-at-all`)).status).toBe(404);
		const api = await outsider.get(`/api/v1/workspaces/${ws.slug}/members`);
		expect(api.status).toBe(404);
		expect((await json<ErrorBody>(api)).error.code).toBe('not-found');
	});

	it('invites by e-mail; the invitation works once; roles decide who may invite', async () => {
		const { client: owner } = await newUser('inviter');
		const ws = await newWorkspace(owner, 'Motor Maps');
		const editor = await inviteAndAccept(owner, ws.slug, 'editor');
		const viewer = await inviteAndAccept(owner, ws.slug, 'viewer');

		const members = await json<{ members: { email: string; role: string }[] }>(await viewer.client.get(`/api/v1/workspaces/${ws.slug}/members`));
		expect(members.members.find((m) => m.email === editor.email)?.role).toBe('editor');

		for (const who of [editor, viewer]) {
			const r = await who.client.post(`/api/v1/workspaces/${ws.slug}/invitations`, { email: 'someone@test.example', role: 'viewer' });
			expect(r.status).toBe(403);
			expect((await json<ErrorBody>(r)).error.message).toMatch(/needs the owner role/);
		}
		expect(await testDb()('invitations').where({ email: 'someone@test.example' }).first()).toBeUndefined();

		// used invitation
		const again = await viewer.client.form(`/invite/${viewer.token}`, {});
		expect(again.status).toBe(400);
		expect(await again.text()).toContain('already accepted');
	});

	it('an expired invitation is refused and adds nobody', async () => {
		const { client: owner } = await newUser('exp-owner');
		const ws = await newWorkspace(owner, 'Expired Invites');
		const guest = await newUser('exp-guest');
		await owner.post(`/api/v1/workspaces/${ws.slug}/invitations`, { email: guest.email, role: 'editor' });
		const { token } = linkIn((await caughtMail(guest.email)).text, '/invite');
		await testDb()('invitations').where({ email: guest.email }).update({ expires_at: testDb().raw(`now() - interval '1 second'`) });
		const page = await guest.client.get(`/invite/${token}`);
		expect(await page.text()).toContain('has expired');
		const r = await guest.client.form(`/invite/${token}`, {});
		expect(r.status).toBe(400);
		expect((await guest.client.get(`/api/v1/workspaces/${ws.slug}/members`)).status).toBe(404);
	});

	it('owners change roles and remove members; the last owner cannot be demoted or removed', async () => {
		const { client: owner, id: ownerId } = await newUser('lastowner');
		const ws = await newWorkspace(owner, 'Owners');
		const editor = await inviteAndAccept(owner, ws.slug, 'editor');

		const demote = await owner.patch(`/api/v1/workspaces/${ws.slug}/members/${ownerId}`, { role: 'editor' });
		expect(demote.status).toBe(409);
		expect((await json<ErrorBody>(demote)).error.message).toMatch(/last owner cannot be demoted/);
		const remove = await owner.del(`/api/v1/workspaces/${ws.slug}/members/${ownerId}`);
		expect(remove.status).toBe(409);
		expect((await testDb()('memberships').where({ user_id: ownerId }).first()).role).toBe('owner');

		// an editor may not change roles
		expect((await editor.client.patch(`/api/v1/workspaces/${ws.slug}/members/${editor.id}`, { role: 'owner' })).status).toBe(403);
		// bad role value
		const bad = await owner.patch(`/api/v1/workspaces/${ws.slug}/members/${editor.id}`, { role: 'admin' });
		expect(bad.status).toBe(422);
		expect(await bad.text()).toContain('role must be owner, editor or viewer');

		expect((await owner.patch(`/api/v1/workspaces/${ws.slug}/members/${editor.id}`, { role: 'owner' })).status).toBe(200);
		// now two owners: the first may step down
		expect((await owner.patch(`/api/v1/workspaces/${ws.slug}/members/${ownerId}`, { role: 'viewer' })).status).toBe(200);
		expect((await editor.client.del(`/api/v1/workspaces/${ws.slug}/members/${ownerId}`)).status).toBe(204);
		expect((await owner.get(`/w/${ws.slug}`)).status).toBe(404);
	});
});
