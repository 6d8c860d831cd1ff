// The upload report through the API against the real server and database: a
// CSV mixing rows with the wrong number of fields, non-numeric cells and blank
// cells gets every problem in one 422, in row order, each naming its row (and
// column for a cell), and nothing is stored.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { json, testDb } from './client';
import { countDatasets, csv, refused, team, upload } from './datasetHelpers';

afterAll(async () => {
	await testDb().destroy();
});

let t: Awaited<ReturnType<typeof team>>;
beforeAll(async () => {
	t = await team('report');
});

// file rows: 1 header, 2 units; 4 short, 5 "n/a", 6 blank eta, 8 an extra field, 9 blank J, 10 "1,2" (thousands), 11 short
const MIXED = csv('J,eta,CT', '-,-,-', '0.1,0.30,0.095', '0.2,0.45', '0.3,n/a,0.080', '0.4,,0.072', '0.5,0.80,0.060', '0.6,0.84,0.050,x', ',0.86,0.043', '0.8,"1,2",0.030', '0.9');

describe('one round for every problem of an upload', () => {
	it('wrong field counts, non-numeric and blank cells: all in one 422, in row order, nothing stored', async () => {
		const body = await refused(t.ws.id, 422, () => upload(t.owner, t.ws.slug, MIXED, 'mixed.csv'));
		expect(body.error.code).toBe('invalid-dataset');
		expect(body.error.details).toEqual([
			{ row: 4, problem: 'row 4 has 2 fields; the table has 3' },
			{ row: 5, column: 'eta', problem: 'row 5, column "eta": "n/a" is not a number' },
			{ row: 6, column: 'eta', problem: 'row 6, column "eta": the cell is empty' },
			{ row: 8, problem: 'row 8 has 4 fields; the table has 3' },
			{ row: 9, column: 'J', problem: 'row 9, column "J": the cell is empty' },
			{ row: 10, column: 'eta', problem: expect.stringMatching(/^row 10, column "eta": "1,2" /) },
			{ row: 11, problem: 'row 11 has 1 field; the table has 3' }
		]);
		expect(body.error.message).toBe('the dataset has 7 problems; the first: row 4 has 2 fields; the table has 3');
		expect(await countDatasets(t.ws.id)).toBe(0);
	});

	it('the dry run gives the same report with a 200, and stores nothing', async () => {
		const r = await upload(t.owner, t.ws.slug, MIXED, 'mixed.csv', {}, '?dryRun=1');
		expect(r.status).toBe(200);
		const report = await json<{ ok: boolean; problemCount: number; leftOutCount: number; rowCount: number; errors: { row?: number }[] }>(r);
		expect(report).toMatchObject({ ok: false, problemCount: 7, leftOutCount: 3, rowCount: 6 });
		expect(report.errors.map((e) => e.row)).toEqual([4, 5, 6, 8, 9, 10, 11]);
		expect(await countDatasets(t.ws.id)).toBe(0);
	});

	it('thousands of problems: the first 100 in row order, a closing "and N more" note, values clipped, a bounded body', async () => {
		const long = 'q'.repeat(2000);
		const lines = ['x,y'];
		for (let i = 0; i < 5000; i++) lines.push(i % 4 === 0 ? String(i) : i % 4 === 1 ? `${i},${long}` : `${i},${i}`);
		const body = await refused(t.ws.id, 422, () => upload(t.owner, t.ws.slug, csv(...lines), 'many.csv'));
		const details = body.error.details!;
		expect(details).toHaveLength(101);
		// rows 2, 3, 6, 7, … alternate a short row and a long word: file row = i + 2
		const expectedRows = Array.from({ length: 2500 }, (_, k) => 2 * k).map((k) => [4 * (k / 2) + 2, 4 * (k / 2) + 3]).flat().slice(0, 100);
		expect(details.slice(0, 100).map((d) => d.row)).toEqual(expectedRows);
		expect(details[1].problem).toContain(`${'q'.repeat(80)}… (2,000 characters)`);
		expect(details[100]).toEqual({
			problem: 'and 2,400 more problems not listed (1,200 rows with the wrong number of fields; 1,200 in column "y"); fix the ones above and check again to see them'
		});
		expect(body.error.message).toContain('the dataset has 2,500 problems (the first 100 are listed)');
		expect(JSON.stringify(body).length).toBeLessThan(30_000);
	});
});
