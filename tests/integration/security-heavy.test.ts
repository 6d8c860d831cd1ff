// Heavy fits never run on the request thread: a fit preview or a study launch's
// fit building goes to a fit thread with a time budget, methods that break down
// past a size are refused with the reason, and /api/health keeps answering.
// Real server, real PostgreSQL.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { healthDuring, json, secondServer, testDb } from './client';
import { team, upload, type Created, type ErrorBody } from './datasetHelpers';

afterAll(async () => {
	await testDb().destroy();
});

/** A smooth, noisy-looking curve of `n` rows (invented test data). */
function bigCurve(n: number): string {
	const lines = ['speed [rpm],torque [N m]'];
	for (let i = 0; i < n; i++) {
		const x = i / (n - 1);
		lines.push(`${(1000 + 9000 * x).toFixed(6)},${(40 * Math.sin(3 * x) + 0.3 * Math.sin(977 * x * x)).toFixed(6)}`);
	}
	return lines.join('\n') + '\n';
}

const quantile = (a: number[], q: number) => [...a].sort((u, v) => u - v)[Math.min(a.length - 1, Math.floor(q * a.length))];

let t: Awaited<ReturnType<typeof team>>;
let bigId: string;
let mediumId: string;
beforeAll(async () => {
	t = await team('heavy');
	const big = await upload(t.owner, t.ws.slug, bigCurve(150_000), 'big-sweep.csv', { name: 'Big sweep' });
	expect(big.status).toBe(201);
	bigId = (await json<Created>(big)).id;
	const medium = await upload(t.owner, t.ws.slug, bigCurve(2_000), 'medium-sweep.csv', { name: 'Medium sweep' });
	expect(medium.status).toBe(201);
	mediumId = (await json<Created>(medium)).id;
}, 120_000);

describe('fit work off the request thread', () => {
	it('a global interpolating polynomial through thousands of points is refused with the reason (422 naming the limit)', async () => {
		const r = await t.viewer.post(`/api/v1/datasets/${mediumId}/fit-preview`, { output: 'torque', method: 'polynomial-global' });
		expect(r.status).toBe(422);
		const body = await json<ErrorBody>(r);
		expect(body.error.code).toBe('too-large');
		expect(body.error.message).toMatch(/polynomial-global takes at most 40 points and this table has 2,000/);
		expect(body.error.message).toMatch(/Runge/);
		expect(body.error.details?.[0].field).toBe('method');
	});

	it('a study launch with five global polynomials on 2,000 rows is refused at once, storing nothing', async () => {
		const before = await testDb()('studies').where({ workspace_id: t.ws.id }).count<{ n: string }[]>('* as n');
		const fits = Array.from({ length: 5 }, () => ({ method: 'polynomial-global' }));
		const r = await t.owner.post(`/api/v1/workspaces/${t.ws.slug}/studies`, {
			name: 'Too many nodes',
			datasetId: mediumId,
			output: 'torque',
			problem: { kind: 'minimize' },
			fits,
			optimizers: [{ method: 'sqp' }],
			starts: { grid: 3 }
		});
		expect(r.status).toBe(422);
		const body = await json<ErrorBody>(r);
		expect(body.error.details?.[0].field).toBe('fits.0');
		expect(body.error.message).toMatch(/at most 40 points/);
		const after = await testDb()('studies').where({ workspace_id: t.ws.id }).count<{ n: string }[]>('* as n');
		expect(after[0].n).toBe(before[0].n);
	});

	it('/api/health keeps answering within 100 ms while heavy previews run', async () => {
		const heavy = Promise.all([
			t.viewer.post(`/api/v1/datasets/${bigId}/fit-preview`, { output: 'torque', method: 'smoothing-spline' }),
			t.viewer.post(`/api/v1/datasets/${bigId}/fit-preview`, { output: 'torque', method: 'polynomial-least-squares', options: { degree: 12 } }),
			t.viewer.post(`/api/v1/datasets/${bigId}/fit-preview`, { output: 'torque', method: 'akima' })
		]);
		const { result: answers, latencies } = await healthDuring(heavy);
		// each heavy request answers, as a result or as a 4xx naming its limit, never a 500
		for (const a of answers) expect([200, 422]).toContain(a.status);
		expect(latencies.length).toBeGreaterThan(3);
		console.log(`health during heavy previews: ${latencies.length} probes, median ${quantile(latencies, 0.5).toFixed(1)} ms, p95 ${quantile(latencies, 0.95).toFixed(1)} ms, max ${Math.max(...latencies).toFixed(1)} ms`);
		expect(quantile(latencies, 0.95)).toBeLessThan(100);
	}, 120_000);
});

describe('the time budget', () => {
	it('a preview past its budget is stopped and answered 422 naming the limit; the server stays up', async () => {
		// a second server of the same build with a 300 ms preview budget
		const { base, stop } = await secondServer({ KINKLESS_WORKERS: '0', KINKLESS_FIT_BUDGET_MS: '300' });
		try {
			const cookie = [...t.viewer.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
			// Warm the new server first: its route modules load on first use and its fit
			// thread starts on the first preview. The 100 ms target is for a running server
			// under load, not for a cold start, so one small preview and a few probes go first.
			const warm = await fetch(`${base}/api/v1/datasets/${mediumId}/fit-preview`, {
				method: 'POST',
				headers: { cookie, 'content-type': 'application/json', origin: base },
				body: JSON.stringify({ output: 'torque', method: 'linear' })
			});
			expect(warm.status).toBe(200);
			for (let i = 0; i < 3; i++) expect((await fetch(`${base}/api/health`)).status).toBe(200);
			const req = fetch(`${base}/api/v1/datasets/${bigId}/fit-preview`, {
				method: 'POST',
				headers: { cookie, 'content-type': 'application/json', origin: base },
				body: JSON.stringify({ output: 'torque', method: 'smoothing-spline' })
			});
			const { result: r, latencies } = await healthDuring(req, base);
			expect(r.status).toBe(422);
			const body = await json<ErrorBody>(r);
			expect(body.error.code).toBe('over-budget');
			expect(body.error.message).toMatch(/did not finish within its 300 ms budget \(the limit for one fit preview\)/);
			expect(body.error.message).toMatch(/150,000 rows/);
			console.log(`health during an over-budget preview: ${latencies.length} probes, p95 ${quantile(latencies, 0.95).toFixed(1)} ms, max ${Math.max(...latencies).toFixed(1)} ms`);
			expect(quantile(latencies, 0.95)).toBeLessThan(100);
			// the pool replaced the stopped thread: a small preview still works
			const ok = await fetch(`${base}/api/v1/datasets/${mediumId}/fit-preview`, {
				method: 'POST',
				headers: { cookie, 'content-type': 'application/json', origin: base },
				body: JSON.stringify({ output: 'torque', method: 'linear' })
			});
			expect(ok.status).toBe(200);
		} finally {
			stop();
		}
	}, 120_000);
});
