import { beforeAll, describe, expect, it } from 'vitest';
import { BASE, Client, json, newUser, newWorkspace, secondServer } from './client';
import { dataset, launch, waitFor } from './studiesFixtures';

// Response headers: the content policy of pages (no inline scripts but SvelteKit's own,
// by hash or nonce), the base headers on static files too, no caching of what a
// signed-in caller sees, HSTS over https, and the shared page's no-referrer kept.

const directives = (csp: string | null) =>
	new Map(
		(csp ?? '')
			.split(';')
			.map((d) => d.trim())
			.filter(Boolean)
			.map((d) => {
				const [name, ...values] = d.split(/\s+/);
				return [name, values] as const;
			})
	);

async function staticAsset(base = BASE): Promise<string> {
	const html = await (await fetch(`${base}/login`)).text();
	const m = html.match(/\/_app\/immutable\/[^"']+\.js/);
	if (!m) throw new Error('no immutable asset linked from /login');
	return m[0];
}

describe('content security policy', () => {
	it('pages allow scripts only from this origin and by hash or nonce, never unsafe-inline', async () => {
		for (const path of ['/', '/login', '/signup', '/reset-password']) {
			const r = await fetch(BASE + path);
			const csp = directives(r.headers.get('content-security-policy'));
			const script = csp.get('script-src') ?? [];
			expect(script, path).toContain("'self'");
			expect(script, path).not.toContain("'unsafe-inline'");
			expect(script, path).not.toContain("'unsafe-eval'");
			expect(script.some((v) => v.startsWith("'nonce-") || v.startsWith("'sha256-")), path).toBe(true);
			expect(csp.get('frame-ancestors'), path).toEqual(["'none'"]);
			expect(csp.get('object-src'), path).toEqual(["'none'"]);
			// the page's one inline script is the one the policy names
			const html = await r.text();
			const nonce = script.find((v) => v.startsWith("'nonce-"));
			if (nonce) expect(html).toContain(`nonce="${nonce.slice(7, -1)}"`);
		}
	});
});

describe('base headers on every response', () => {
	it('static files, pages and the API all carry them', async () => {
		for (const path of ['/favicon.svg', await staticAsset(), '/login', '/api/health', '/no-such-page']) {
			const r = await fetch(BASE + path);
			await r.arrayBuffer();
			expect(r.headers.get('x-content-type-options'), path).toBe('nosniff');
			expect(r.headers.get('x-frame-options'), path).toBe('DENY');
			expect(r.headers.get('referrer-policy'), path).toBe('same-origin');
			expect(r.headers.get('content-security-policy'), path).toBeTruthy();
			// plain http here: no HSTS
			expect(r.headers.get('strict-transport-security'), path).toBeNull();
		}
		const svg = await fetch(`${BASE}/favicon.svg`);
		expect(directives(svg.headers.get('content-security-policy')).get('default-src')).toEqual(["'none'"]);
	});

	it('HSTS when the origin is https, on static files and pages', async () => {
		const server = await secondServer({ ORIGIN: 'https://kinkless.test.example' });
		try {
			for (const path of ['/favicon.svg', await staticAsset(server.base), '/login']) {
				const r = await fetch(server.base + path);
				await r.arrayBuffer();
				expect(r.headers.get('strict-transport-security'), path).toMatch(/^max-age=31536000/);
			}
		} finally {
			server.stop();
		}
	}, 30_000);
});

describe('caching', () => {
	it('signed-in pages and their data are private, no-store; so is every API answer', async () => {
		const { client } = await newUser('cache');
		const ws = await newWorkspace(client, 'Cache check');
		for (const path of ['/', '/settings', '/settings/__data.json', `/w/${ws.slug}`, `/w/${ws.slug}/__data.json`, '/api/v1/workspaces']) {
			const r = await client.get(path);
			expect(r.status, path).toBe(200);
			expect(r.headers.get('cache-control'), path).toBe('private, no-store');
		}
		const anonymous = await fetch(`${BASE}/api/v1/workspaces`);
		expect(anonymous.headers.get('cache-control')).toContain('no-store');
	});
});

describe('the shared page', () => {
	let token = '';
	beforeAll(async () => {
		const { client } = await newUser('share-headers');
		const ws = await newWorkspace(client, 'Share headers');
		const datasetId = await dataset(client, ws.slug);
		const id = await launch(client, ws.slug, {
			name: 'Headers',
			datasetId,
			output: 'eta',
			problem: { kind: 'maximize' },
			fits: [{ method: 'pchip' }],
			optimizers: [{ method: 'bfgs' }],
			starts: { latinHypercube: 2, seed: 1 }
		});
		await waitFor(client, id);
		token = (await json<{ token: string }>(await client.post(`/api/v1/studies/${id}/share`))).token;
	}, 60_000);

	it('keeps no-referrer (the base header does not overwrite it)', async () => {
		for (const path of [`/shared/${token}`, `/api/v1/shared/${token}`]) {
			const r = await new Client().get(path);
			expect(r.status, path).toBe(200);
			expect(r.headers.get('referrer-policy'), path).toBe('no-referrer');
		}
	});
});
