// Error reports never echo a user's huge cell back: a 19 MB cell used to come
// back twice in a 38 MB 422 body. Quoted values are clipped; a header past the
// column-name limit is refused naming the limit. Real server, real PostgreSQL.
import { afterAll, describe, expect, it } from 'vitest';
import { testDb } from './client';
import { countDatasets, team, upload, type ErrorBody } from './datasetHelpers';

afterAll(async () => {
	await testDb().destroy();
});

const big = 'x'.repeat(19 * 1024 * 1024);

describe('error reports quote at most a little of a cell', () => {
	it('a 19 MB text cell in a number column: 422 naming row and column, the body a few KB', async () => {
		const t = await team('clip');
		const before = await countDatasets(t.ws.id);
		const csv = `speed [rpm],torque [N m]\n1000,1\n2000,${big}\n3000,3\n`;
		const r = await upload(t.owner, t.ws.slug, csv, 'huge-cell.csv');
		expect(r.status).toBe(422);
		const text = await r.text();
		expect(text.length).toBeLessThan(20_000);
		const body = JSON.parse(text) as ErrorBody;
		const detail = body.error.details!.find((d) => d.row === 3);
		expect(detail?.column).toBe('torque');
		expect(JSON.stringify(body)).toMatch(/x{80}… \(19,922,944 characters\)/);
		expect(await countDatasets(t.ws.id)).toBe(before);
	}, 60_000);

	it('a 19 MB header is refused naming the column-name limit, without echoing it', async () => {
		const t = await team('clip-head');
		const before = await countDatasets(t.ws.id);
		const r = await upload(t.owner, t.ws.slug, `speed,${big}\n1,2\n2,3\n`, 'huge-header.csv');
		expect(r.status).toBe(422);
		const text = await r.text();
		expect(text.length).toBeLessThan(5_000);
		const body = JSON.parse(text) as ErrorBody;
		expect(body.error.code).toBe('column-name-too-long');
		expect(body.error.message).toMatch(/has a header of 19,922,944 characters .*the limit is 200/);
		expect(await countDatasets(t.ws.id)).toBe(before);
	}, 60_000);
});
