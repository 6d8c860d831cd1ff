import { afterAll, describe, expect, it } from 'vitest';
import { caughtMail, Client, json, linkIn, newUser, testDb, uniqueEmail } from './client';

type ErrorBody = { error: { code: string; message: string; details?: { field?: string; problem: string }[] } };

afterAll(async () => {
	await testDb().destroy();
});

describe('sign-up', () => {
	it('creates an account, hashes the password with argon2id, and answers the exact shape', async () => {
		const c = new Client();
		const email = uniqueEmail('signup');
		const r = await c.post('/api/v1/users', { email, password: 'long-enough-pw', name: 'Ada' });
		expect(r.status).toBe(201);
		const body = await json<{ id: string; email: string }>(r);
		expect(Object.keys(body).sort()).toEqual(['email', 'id']);
		expect(body.email).toBe(email);
		const row = await testDb()('users').where({ email }).first();
		expect(row.password_hash).toMatch(/^\$argon2id\$/);
		expect(row.password_hash).not.toContain('long-enough-pw');
	});

	it('refuses a taken e-mail with 409 and keeps the first account', async () => {
		const { email } = await newUser('taken');
		const before = await testDb()('users').where({ email }).first();
		const r = await new Client().post('/api/v1/users', { email: email.toUpperCase(), password: 'another-password', name: 'Impostor' });
		expect(r.status).toBe(409);
		const body = await json<ErrorBody>(r);
		expect(body.error.code).toBe('email-taken');
		expect(body.error.message).toMatch(/already exists/);
		const after = await testDb()('users').where({ email }).first();
		expect(after.password_hash).toBe(before.password_hash);
		expect(after.name).toBe(before.name);
	});

	it.each([
		[{ email: 'not-an-address', password: 'long-enough-pw', name: 'A' }, 'email', /valid e-mail/],
		[{ email: uniqueEmail('short'), password: 'short', name: 'A' }, 'password', /at least 10 characters/],
		[{ email: uniqueEmail('noname'), password: 'long-enough-pw', name: '' }, 'name', /name is required/]
	])('rejects bad field %#: 422 naming the field', async (body, field, problem) => {
		const r = await new Client().post('/api/v1/users', body);
		expect(r.status).toBe(422);
		const err = await json<ErrorBody>(r);
		expect(err.error.code).toBe('invalid');
		const d = err.error.details!.find((x) => x.field === field);
		expect(d?.problem).toMatch(problem);
		if (body.email.includes('@')) expect(await testDb()('users').where({ email: body.email }).first()).toBeUndefined();
	});

	it('rejects a body that is not JSON with 400', async () => {
		const r = await new Client().post('/api/v1/users', '{"email":', { 'content-type': 'application/json' });
		expect(r.status).toBe(400);
		expect((await json<ErrorBody>(r)).error.code).toBe('bad-json');
	});

	it('the sign-up form shows the error and keeps the typed values (no JavaScript)', async () => {
		const c = new Client();
		const r = await c.form('/signup', { name: 'Bo', email: 'bo@example.com', password: 'short' });
		expect(r.status).toBe(422);
		const html = await r.text();
		expect(html).toContain('password must be at least 10 characters');
	});
});

describe('sign-in', () => {
	it('gives a new HttpOnly, SameSite=Lax session cookie at each sign-in', async () => {
		const { client, email, password } = await newUser('cookie');
		const first = client.cookies.get('kinkless_session');
		const r = await client.post('/api/v1/session', { email, password });
		expect(r.status).toBe(200);
		const setCookie = r.headers.getSetCookie().find((c) => c.startsWith('kinkless_session='))!;
		expect(setCookie).toMatch(/HttpOnly/i);
		expect(setCookie).toMatch(/SameSite=Lax/i);
		expect(setCookie).not.toMatch(/Secure/i); // served over plain http on loopback
		expect(client.cookies.get('kinkless_session')).not.toBe(first);
		// the old session no longer works
		const old = new Client();
		old.cookies.set('kinkless_session', first!);
		expect((await old.get('/api/v1/workspaces')).status).toBe(401);
	});

	it('a wrong password and an unknown account get the same answer', async () => {
		const { email } = await newUser('wrongpw');
		const a = await new Client().post('/api/v1/session', { email, password: 'not-the-password' });
		const b = await new Client().post('/api/v1/session', { email: uniqueEmail('ghost'), password: 'not-the-password' });
		expect(a.status).toBe(401);
		expect(b.status).toBe(401);
		const ea = await json<ErrorBody>(a);
		const eb = await json<ErrorBody>(b);
		expect(ea).toEqual(eb);
		expect(ea.error.message).toBe('wrong e-mail or password');
	});

	it('rate-limits failed sign-ins per account (limit 10 in the test server), even with the right password afterwards', async () => {
		const { email, password } = await newUser('ratelimit');
		let last = 0;
		for (let i = 0; i < 10; i++) last = (await new Client().post('/api/v1/session', { email, password: 'wrong-password-' + i })).status;
		expect(last).toBe(401);
		const blocked = await new Client().post('/api/v1/session', { email, password });
		expect(blocked.status).toBe(429);
		expect((await json<ErrorBody>(blocked)).error.message).toMatch(/too many failed sign-ins/);
		await testDb()('sign_in_attempts').where('key', 'like', `pair:${email}|%`).delete();
		expect((await new Client().post('/api/v1/session', { email, password })).status).toBe(200);
	});

	it('sign-out ends the session', async () => {
		const { client } = await newUser('signout');
		expect((await client.get('/api/v1/workspaces')).status).toBe(200);
		expect((await client.del('/api/v1/session')).status).toBe(204);
		expect((await client.get('/api/v1/workspaces')).status).toBe(401);
	});
});

describe('password reset', () => {
	it('e-mails a single-use link that sets a new password and ends old sessions', async () => {
		const { client, email } = await newUser('reset');
		const c = new Client();
		const r = await c.form('/reset-password', { email });
		expect(r.status).toBe(200);
		const mail = await caughtMail(email);
		expect(mail.subject).toMatch(/Reset your Kinkless password/);
		const { token } = linkIn(mail.text, '/reset-password');
		const done = await c.form(`/reset-password/${token}`, { password: 'brand-new-password' });
		expect(done.status).toBe(303);
		expect(done.headers.get('location')).toBe('/login?reset=1');
		expect((await client.get('/api/v1/workspaces')).status).toBe(401);
		expect((await new Client().post('/api/v1/session', { email, password: 'brand-new-password' })).status).toBe(200);
		// used: a second use fails and the password stays
		const again = await c.form(`/reset-password/${token}`, { password: 'third-password-x' });
		expect(again.status).toBe(400);
		expect(await again.text()).toContain('already used');
		expect((await new Client().post('/api/v1/session', { email, password: 'brand-new-password' })).status).toBe(200);
	});

	it('an expired link is refused with a clear message', async () => {
		const { email, password } = await newUser('expired');
		await new Client().form('/reset-password', { email });
		const { token } = linkIn((await caughtMail(email)).text, '/reset-password');
		await testDb()('password_resets').whereIn('user_id', testDb()('users').where({ email }).select('id')).update({ expires_at: testDb().raw(`now() - interval '1 minute'`) });
		const page = await new Client().get(`/reset-password/${token}`);
		expect(await page.text()).toContain('has expired');
		const r = await new Client().form(`/reset-password/${token}`, { password: 'some-new-password' });
		expect(r.status).toBe(400);
		expect((await new Client().post('/api/v1/session', { email, password })).status).toBe(200);
	});

	it('answers the same for an unknown address and sends nothing', async () => {
		const ghost = uniqueEmail('ghost');
		const r = await new Client().form('/reset-password', { email: ghost });
		expect(r.status).toBe(200);
		await new Promise((res) => setTimeout(res, 300));
		expect(await testDb()('caught_mail').whereRaw('? = ANY(rcpt_to)', [ghost]).first()).toBeUndefined();
	});
});

describe('cross-site requests', () => {
	it('refuses a cookie-authenticated form post from another origin', async () => {
		const { client } = await newUser('csrf');
		const r = await client.request('POST', '/?/createWorkspace', new URLSearchParams({ name: 'Evil' }).toString(), {
			'content-type': 'application/x-www-form-urlencoded',
			origin: 'http://evil.example'
		});
		expect(r.status).toBe(403);
		expect(await json(await client.get('/api/v1/workspaces'))).toEqual({ workspaces: [] });
	});
});
