// Issue: the caught-mail viewer must never show one account another's mail, and
// must not exist outside local development. Against the real server and database.
import { afterAll, describe, expect, it } from 'vitest';
import { caughtMail, Client, linkIn, newUser, secondServer, testDb } from './client';

afterAll(async () => {
	await testDb().destroy();
});

/** `GET /dev/mail` anonymously on a second server started with `env` (local use by default). */
async function devMailStatusWith(env: Record<string, string | undefined>): Promise<{ status: number; location: string | null }> {
	const server = await secondServer({ KINKLESS_LOCAL: '1', ...env });
	try {
		const r = await fetch(`${server.base}/dev/mail`, { redirect: 'manual' });
		return { status: r.status, location: r.headers.get('location') };
	} finally {
		server.stop();
	}
}

describe('caught-mail viewer', () => {
	it('shows a signed-in user only the mail addressed to them (another account cannot read a reset link)', async () => {
		const victim = await newUser('victim');
		const attacker = await newUser('attacker');
		await new Client().form('/reset-password', { email: victim.email });
		const { token } = linkIn((await caughtMail(victim.email)).text, '/reset-password');

		const seenByAttacker = await (await attacker.client.get('/dev/mail')).text();
		expect(seenByAttacker).toContain('Caught mail');
		expect(seenByAttacker).not.toContain(token);
		expect(seenByAttacker).not.toContain(victim.email);

		const seenByVictim = await (await victim.client.get('/dev/mail')).text();
		expect(seenByVictim).toContain(token);
	});

	it('asks anonymous visitors to sign in', async () => {
		const r = await new Client().get('/dev/mail');
		expect(r.status).toBe(303);
		expect(r.headers.get('location')).toMatch(/^\/login\?next=/);
	});

	// Each row: an environment a deployment might run with, and whether the viewer exists.
	it.each([
		['started for local use on a loopback origin (control)', {}, true],
		['SMTP_URL set (real mail server)', { SMTP_URL: 'smtp://127.0.0.1:1' }, false],
		['NODE_ENV=production', { NODE_ENV: 'production' }, false],
		['not started by the local scripts (no KINKLESS_LOCAL)', { KINKLESS_LOCAL: undefined }, false],
		['public origin not on loopback', { ORIGIN: 'https://kinkless.example.com' }, false]
	] as const)('%s → viewer %s', async (_label, env, enabled) => {
		const { status, location } = await devMailStatusWith(env);
		if (enabled) {
			expect(status).toBe(303);
			expect(location).toMatch(/^\/login/);
		} else {
			expect(status).toBe(404);
		}
	}, 30_000);
});

describe('invitations are bound to their address', () => {
	it('a signed-in account with another e-mail cannot accept a stolen link; the invitee still can', async () => {
		const owner = await newUser('inv-owner');
		const ws = await (await owner.client.post('/api/v1/workspaces', { name: 'Bound Invites' })).json();
		const invitee = await newUser('invitee');
		const thief = await newUser('thief');
		const r = await owner.client.post(`/api/v1/workspaces/${ws.slug}/invitations`, { email: invitee.email, role: 'owner' });
		expect(r.status).toBe(201);
		const { token } = linkIn((await caughtMail(invitee.email)).text, '/invite');

		const page = await (await thief.client.get(`/invite/${token}`)).text();
		expect(page).toContain('only the account with that address can accept it');
		expect(page).not.toContain('Accept and open the workspace');

		const stolen = await thief.client.form(`/invite/${token}`, {});
		expect(stolen.status).toBe(403);
		expect(await stolen.text()).toContain('this invitation is for another e-mail address');
		expect(await testDb()('memberships').where({ workspace_id: ws.id, user_id: thief.id }).first()).toBeUndefined();
		expect((await thief.client.get(`/api/v1/workspaces/${ws.slug}/members`)).status).toBe(404);
		// the refused attempt did not use the invitation up
		expect((await testDb()('invitations').where({ email: invitee.email }).first()).accepted_at).toBeNull();

		const accepted = await invitee.client.form(`/invite/${token}`, {});
		expect(accepted.status).toBe(303);
		expect((await testDb()('memberships').where({ workspace_id: ws.id, user_id: invitee.id }).first()).role).toBe('owner');
	});

	it('matches the address regardless of letter case', async () => {
		const owner = await newUser('inv-case');
		const ws = await (await owner.client.post('/api/v1/workspaces', { name: 'Case Invites' })).json();
		const invitee = await newUser('case');
		await owner.client.post(`/api/v1/workspaces/${ws.slug}/invitations`, { email: invitee.email.toUpperCase(), role: 'viewer' });
		const { token } = linkIn((await caughtMail(invitee.email)).text, '/invite');
		expect((await invitee.client.form(`/invite/${token}`, {})).status).toBe(303);
	});
});
