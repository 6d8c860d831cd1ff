import { spawn } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { BASE, freePort } from './client';

describe('GET /api/health', () => {
	it('answers ok with the database up', async () => {
		const r = await fetch(`${BASE}/api/health`);
		expect(r.status).toBe(200);
		expect(await r.json()).toEqual({ ok: true, db: 'up' });
	});

	it('answers 503 db "down" when the database is unreachable (a second server pointed at a closed port)', async () => {
		const [port, deadDb] = [await freePort(), await freePort()];
		const child = spawn('node', ['scripts/serve.mjs'], {
			env: { ...process.env, PORT: String(port), HOST: '127.0.0.1', ORIGIN: `http://127.0.0.1:${port}`, DATABASE_URL: `postgres://app@127.0.0.1:${deadDb}/none` },
			stdio: 'ignore'
		});
		try {
			let res: Response | null = null;
			for (let i = 0; i < 100 && !res; i++) {
				res = await fetch(`http://127.0.0.1:${port}/api/health`).catch(() => null);
				if (!res) await new Promise((r) => setTimeout(r, 100));
			}
			expect(res?.status).toBe(503);
			expect(await res!.json()).toEqual({ ok: false, db: 'down' });
		} finally {
			child.kill('SIGKILL');
		}
	});
});
