// Open redirect after sign-in / sign-up: `next` may only name a path on our own
// origin. The bypass list is the usual one (OWASP's unvalidated-redirects cheat
// sheet and common practice): backslashes, control characters browsers strip,
// protocol-relative and dot-segment forms, encoded slashes, other schemes.
import { afterAll, describe, expect, it } from 'vitest';
import { BASE, Client, newUser, testDb, uniqueEmail } from './client';

afterAll(async () => {
	await testDb().destroy();
});

const bypasses = [
	'/%5Cevil.example/path',
	'/%09/evil.example',
	'/%0D%0A/evil.example',
	'//evil.example',
	'/%2F/evil.example',
	'%2F%2Fevil.example',
	'/.//evil.example',
	'/./%2F/evil.example',
	'https://evil.example/',
	'https:evil.example',
	'http:/evil.example',
	'javascript:alert(1)',
	'%5C%5Cevil.example'
];

/** A redirect target the browser would resolve to our own origin, as a plain path. */
function expectSameOrigin(location: string | null) {
	expect(location).not.toBeNull();
	expect(location!.startsWith('/')).toBe(true);
	expect(location!.startsWith('//')).toBe(false);
	// eslint-disable-next-line no-control-regex
	expect(location).not.toMatch(/[\\\u0000-\u001f]/);
	expect(new URL(location!, BASE).origin).toBe(new URL(BASE).origin);
}

describe('sign-in and sign-up redirect only to our own origin', () => {
	it.each(bypasses)('sign-in with next=%s lands on a same-origin path', async (raw) => {
		const { email, password } = await newUser('redir');
		const r = await new Client().form(`/login?next=${raw}`, { email, password });
		expect(r.status).toBe(303);
		expectSameOrigin(r.headers.get('location'));
		expect(r.headers.get('location')).toBe('/');
	});

	it.each(bypasses.slice(0, 4))('sign-up with next=%s lands on a same-origin path', async (raw) => {
		const r = await new Client().form(`/signup?next=${raw}`, { name: 'Redirect Test', email: uniqueEmail('redir-up'), password: 'long-enough-pw' });
		expect(r.status).toBe(303);
		expect(r.headers.get('location')).toBe('/');
	});

	it('an ideographic full stop is a path segment here, not a dot: it stays on our origin', async () => {
		const { email, password } = await newUser('redir-cjk');
		const r = await new Client().form(`/login?next=/%E3%80%82/evil.example`, { email, password });
		expect(r.status).toBe(303);
		expectSameOrigin(r.headers.get('location'));
	});

	it('keeps a legitimate same-origin path with its query and fragment', async () => {
		const { email, password } = await newUser('redir-ok');
		const r = await new Client().form(`/login?next=${encodeURIComponent('/settings?tab=tokens#new')}`, { email, password });
		expect(r.status).toBe(303);
		expect(r.headers.get('location')).toBe('/settings?tab=tokens#new');
	});

	it('a signed-in visitor to /login?next=… is redirected the same safe way', async () => {
		const { client } = await newUser('redir-in');
		const r = await client.get('/login?next=/%5Cevil.example');
		expect(r.status).toBe(303);
		expect(r.headers.get('location')).toBe('/');
	});
});
