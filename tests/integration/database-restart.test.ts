import { createServer, connect, type Server, type Socket } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, freePort, json, secondServer, uniqueEmail } from './client';

// A database restart: a second server reaches PostgreSQL through a TCP relay this test
// controls. Cutting the relay (every connection dropped, new ones refused) is what the app
// sees while PostgreSQL restarts; every answer must then be 503 with retry-after, never a
// 500, nothing half-written; when the relay is back the app recovers by itself.
const target = new URL(process.env.DATABASE_URL!);
let relayPort = 0;
let relay: Server | null = null;
const sockets = new Set<Socket>();

function relayUp(): Promise<void> {
	relay = createServer((client) => {
		const upstream = connect(Number(target.port || 5432), target.hostname);
		for (const s of [client, upstream]) {
			sockets.add(s);
			s.on('close', () => sockets.delete(s));
			s.on('error', () => s.destroy());
		}
		client.pipe(upstream).pipe(client);
	});
	return new Promise((resolve) => relay!.listen(relayPort, '127.0.0.1', () => resolve()));
}

function relayDown(): Promise<void> {
	for (const s of sockets) s.destroy();
	return new Promise((resolve) => relay!.close(() => resolve()));
}

let server: { base: string; stop: () => void };
beforeAll(async () => {
	relayPort = await freePort();
	await relayUp();
	const url = new URL(target);
	url.hostname = '127.0.0.1';
	url.port = String(relayPort);
	server = await secondServer({ DATABASE_URL: url.toString(), KINKLESS_WORKERS: '0' });
}, 30_000);
afterAll(async () => {
	server?.stop();
	for (const s of sockets) s.destroy();
	relay?.close();
});

describe('while PostgreSQL restarts', () => {
	it('answers 503 with retry-after on the API and pages, changes nothing, and recovers', async () => {
		const c = new Client(server.base);
		const email = uniqueEmail('restart');
		expect((await c.post('/api/v1/users', { email, password: 'correct-horse-battery', name: 'Restart' })).status).toBe(201);
		expect((await c.post('/api/v1/session', { email, password: 'correct-horse-battery' })).status).toBe(200);
		expect((await c.get('/api/v1/workspaces')).status).toBe(200);

		await relayDown();
		for (const [method, path, body] of [
			['GET', '/api/v1/workspaces'],
			['POST', '/api/v1/workspaces', { name: 'Made while down' }],
			['GET', '/settings'],
			['GET', '/']
		] as [string, string, unknown?][]) {
			const r = await c.request(method, path, body);
			const text = await r.text();
			expect(r.status, `${method} ${path}: ${text.slice(0, 200)}`).toBe(503);
			expect(r.headers.get('retry-after'), path).toBe('5');
			if (path.startsWith('/api/')) expect(JSON.parse(text).error.code).toBe('unavailable');
		}
		const signIn = await new Client(server.base).post('/api/v1/session', { email, password: 'correct-horse-battery' });
		expect(signIn.status).toBe(503);

		await relayUp();
		let status = 0;
		for (let i = 0; i < 50 && status !== 200; i++) {
			status = (await c.get('/api/v1/workspaces')).status;
			if (status !== 200) await new Promise((r) => setTimeout(r, 200));
		}
		expect(status).toBe(200);
		// the POST made while the database was away left nothing behind
		expect(await json(await c.get('/api/v1/workspaces'))).toEqual({ workspaces: [] });
		expect((await c.get('/settings')).status).toBe(200);
	});
});

describe('methods and media types', () => {
	it('405 and 415 use the JSON error shape with the right code', async () => {
		const { status, headers, body } = await fetch(`${process.env.KINKLESS_TEST_URL}/api/v1/workspaces`, { method: 'PUT' }).then(async (r) => ({ status: r.status, headers: r.headers, body: await r.json() }));
		expect(status).toBe(405);
		expect(body.error.code).toBe('method-not-allowed');
		expect(body.error.message).toMatch(/PUT is not allowed here/);
		expect(headers.get('allow')).toContain('GET');
		const anon = new Client();
		const r = await anon.request('POST', '/api/v1/session', '<xml/>', { 'content-type': 'application/xml' });
		expect(r.status).toBe(415);
		const b = await json<{ error: { code: string; message: string } }>(r);
		expect(b.error.code).toBe('unsupported-media-type');
		expect(b.error.message).toContain('application/json');
	});
});
