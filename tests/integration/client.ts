// Talks to the real server that `npm test` started (KINKLESS_TEST_URL) and to its
// real database (DATABASE_URL). No mocks.
import knex, { type Knex } from 'knex';
import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { createServer } from 'node:net';

export const BASE = process.env.KINKLESS_TEST_URL ?? '';
if (!BASE) throw new Error('KINKLESS_TEST_URL is not set: run the integration tests through `npm test`, which starts the server');

let handle: Knex | null = null;
export function testDb(): Knex {
	handle ??= knex({ client: 'pg', connection: process.env.DATABASE_URL, pool: { min: 0, max: 3 } });
	return handle;
}

export const uniqueEmail = (tag = 'user') => `${tag}-${randomBytes(5).toString('hex')}@test.example`;

/** A fetch wrapper with its own cookie jar (one per simulated browser or script). */
export class Client {
	cookies = new Map<string, string>();
	bearer: string | null = null;

	/** `base`: another server than the suite's; `headers`: sent with every request (e.g. x-forwarded-for) */
	constructor(
		readonly base = BASE,
		readonly headers: Record<string, string> = {}
	) {}

	async request(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<Response> {
		const h: Record<string, string> = { ...this.headers, ...headers };
		if (this.cookies.size) h.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
		if (this.bearer) h.authorization = `Bearer ${this.bearer}`;
		let payload: BodyInit | undefined;
		if (body instanceof FormData || typeof body === 'string') payload = body;
		else if (body !== undefined) {
			payload = JSON.stringify(body);
			h['content-type'] ??= 'application/json';
		}
		const res = await fetch(this.base + path, { method, headers: h, body: payload, redirect: 'manual' });
		for (const c of res.headers.getSetCookie()) {
			const [pair] = c.split(';');
			const i = pair.indexOf('=');
			const name = pair.slice(0, i);
			const value = pair.slice(i + 1);
			if (value === '' || /max-age=0/i.test(c)) this.cookies.delete(name);
			else this.cookies.set(name, value);
		}
		return res;
	}
	get = (path: string) => this.request('GET', path);
	post = (path: string, body?: unknown, headers?: Record<string, string>) => this.request('POST', path, body, headers);
	del = (path: string) => this.request('DELETE', path);
	patch = (path: string, body?: unknown) => this.request('PATCH', path, body);

	/** Submit a SvelteKit form action the way a browser without JavaScript would. */
	form(path: string, fields: Record<string, string>) {
		return this.request('POST', path, new URLSearchParams(fields).toString(), {
			'content-type': 'application/x-www-form-urlencoded',
			accept: 'text/html',
			origin: new URL(this.base).origin
		});
	}
}

export async function json<T = Record<string, unknown>>(res: Response): Promise<T> {
	const text = await res.text();
	try {
		return JSON.parse(text) as T;
	} catch {
		throw new Error(`expected JSON, got ${res.status}: ${text.slice(0, 300)}`);
	}
}

/** Sign up through the API and sign in; returns the signed-in client. */
export async function newUser(tag = 'user', password = 'correct-horse-battery') {
	const email = uniqueEmail(tag);
	const c = new Client();
	const r = await c.post('/api/v1/users', { email, password, name: `Test ${tag}` });
	if (r.status !== 201) throw new Error(`sign-up failed: ${r.status} ${await r.text()}`);
	const s = await c.post('/api/v1/session', { email, password });
	if (s.status !== 200) throw new Error(`sign-in failed: ${s.status} ${await s.text()}`);
	const { id } = await json<{ id: string }>(s);
	return { client: c, email, password, id };
}

export async function newWorkspace(c: Client, name = 'Test workspace') {
	const r = await c.post('/api/v1/workspaces', { name });
	if (r.status !== 201) throw new Error(`workspace create failed: ${r.status} ${await r.text()}`);
	return json<{ id: string; slug: string; name: string }>(r);
}

/** The newest caught message to `to`, waiting for the catcher to store it. */
export async function caughtMail(to: string, timeoutMs = 10_000): Promise<{ subject: string; text: string }> {
	const t0 = Date.now();
	while (Date.now() - t0 < timeoutMs) {
		const row = await testDb()('caught_mail').whereRaw('? = ANY(rcpt_to)', [to.toLowerCase()]).orderBy('id', 'desc').first('subject', 'text');
		if (row) return row;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`no mail caught for ${to} within ${timeoutMs} ms`);
}

export const linkIn = (text: string, path: string) => {
	const m = text.match(new RegExp(`https?://\\S+${path}/([A-Za-z0-9_-]+)`));
	if (!m) throw new Error(`no ${path} link in: ${text}`);
	return { url: m[0], token: m[1] };
};

/** A free TCP port on loopback. */
export const freePort = () =>
	new Promise<number>((resolve) => {
		const s = createServer().listen(0, '127.0.0.1', () => {
			const { port } = s.address() as { port: number };
			s.close(() => resolve(port));
		});
	});

/**
 * A second server of the same build with its own environment (entries set to
 * undefined are removed), on its own port and mail-catcher port; resolves once
 * it answers /api/health (any status).
 */
export async function secondServer(env: Record<string, string | undefined>): Promise<{ base: string; stop: () => void }> {
	const port = await freePort();
	const base = `http://127.0.0.1:${port}`;
	const childEnv: Record<string, string | undefined> = { ...process.env, PORT: String(port), HOST: '127.0.0.1', ORIGIN: base, SMTP_CATCHER_PORT: String(await freePort()), ...env };
	for (const k of Object.keys(childEnv)) if (childEnv[k] === undefined) delete childEnv[k];
	const child = spawn('node', ['scripts/serve.mjs'], { env: childEnv as NodeJS.ProcessEnv, stdio: 'ignore' });
	const stop = () => void child.kill('SIGKILL');
	for (let i = 0; i < 150 && !(await fetch(`${base}/api/health`).catch(() => null)); i++) await new Promise((r) => setTimeout(r, 100));
	return { base, stop };
}

/** Probe /api/health every 25 ms while `work` runs: its result and every probe's latency in ms (each probe must answer 200). */
export async function healthDuring<T>(work: Promise<T>, base = BASE): Promise<{ result: T; latencies: number[] }> {
	const latencies: number[] = [];
	let done = false;
	const finished = work.finally(() => (done = true));
	while (!done) {
		const t0 = performance.now();
		const r = await fetch(`${base}/api/health`);
		await r.arrayBuffer();
		latencies.push(performance.now() - t0);
		if (r.status !== 200) throw new Error(`/api/health answered ${r.status} while the work ran`);
		await new Promise((res) => setTimeout(res, 25));
	}
	return { result: await finished, latencies };
}
