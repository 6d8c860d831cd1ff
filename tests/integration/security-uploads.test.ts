// Decompression bombs and huge tables never reach the request thread: a workbook
// is refused from the sizes its ZIP directory declares before anything expands;
// one that lies about them is read as a stream on an offload thread and stopped
// at the row limit as it is reached; CSV is read off the
// request thread too. /api/health answers throughout. Real server, real PostgreSQL.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { healthDuring, json, testDb } from './client';
import { countDatasets, team, upload, type ErrorBody } from './datasetHelpers';
import { handWrittenSheet } from '../unit/datasets/helpers';

afterAll(async () => {
	await testDb().destroy();
});


let t: Awaited<ReturnType<typeof team>>;
beforeAll(async () => {
	t = await team('bomb');
});

describe('upload limits hold before the work is done', () => {
	it('a small workbook that expands to over 100 MB of sheet XML is refused at once with 413 naming the limit', async () => {
		const bytes = await handWrittenSheet(3_000_000, { addressed: false });
		expect(bytes.byteLength).toBeLessThan(20 * 1024 * 1024);
		const before = await countDatasets(t.ws.id);
		const t0 = performance.now();
		const { result: r, latencies } = await healthDuring(upload(t.owner, t.ws.slug, bytes, 'bomb.xlsx'));
		const elapsed = performance.now() - t0;
		const worst = Math.max(...latencies);
		expect(r.status).toBe(413);
		const body = await json<ErrorBody>(r);
		expect(body.error.code).toBe('expands-too-far');
		expect(body.error.message).toMatch(/the workbook expands to \d+(\.\d)? MB of sheet data; the limit is 96 MB/);
		console.log(`bomb of ${(bytes.byteLength / 1024).toFixed(0)} KB: refused in ${elapsed.toFixed(0)} ms, worst health probe ${worst.toFixed(1)} ms`);
		// refused from the directory, before any inflating: well under a second (the server froze for 42 s before)
		expect(elapsed).toBeLessThan(5_000);
		// the request thread never stalls (one probe on a loaded two-core machine may wait for a scheduler slice)
		expect(worst).toBeLessThan(500);
		expect(await countDatasets(t.ws.id)).toBe(before);
	}, 120_000);

	it('a workbook whose directory lies about its sizes is read as a stream and stopped at the row limit, off the request thread', async () => {
		// 1,100,000 addressed rows (11 MB on disk), every part declared as 1 KB
		const bytes = await handWrittenSheet(1_100_000, { lie: true });
		expect(bytes.byteLength).toBeLessThan(20 * 1024 * 1024);
		const before = await countDatasets(t.ws.id);
		const { result: r, latencies } = await healthDuring(upload(t.owner, t.ws.slug, bytes, 'liar.xlsx'));
		const worst = Math.max(...latencies);
		expect(r.status).toBe(413);
		const body = await json<ErrorBody>(r);
		expect(body.error.code).toBe('too-many-rows');
		expect(body.error.message).toMatch(/table has more than 1,000,000 rows; the limit is 1,000,000 rows/);
		console.log(`lying bomb: ${r.status} ${body.error.code}: ${body.error.message.slice(0, 160)}; worst health probe ${worst.toFixed(1)} ms`);
		expect(worst).toBeLessThan(500);
		expect(await countDatasets(t.ws.id)).toBe(before);
		// the server is fine afterwards: a small upload works
		const ok = await upload(t.owner, t.ws.slug, 'x,y\n1,2\n2,3\n3,5\n', 'small.csv');
		expect(ok.status).toBe(201);
	}, 180_000);
});
