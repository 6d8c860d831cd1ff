// The upload report: every problem of a table in one round, in row order,
// bounded with an "and N more" note, and the preview rows that highlight them.
// Expected orders and counts come from an independent scan of the test's own
// rows (common practice, no source).
import { describe, expect, test } from 'vitest';
import { orderProblems } from '../../../src/lib/server/datasets/problemReport';
import { previewRows } from '../../../src/lib/server/datasets/previewRows';
import { reportErrorBody } from '../../../src/lib/server/datasets/reportErrorBody';
import { validateTable } from '../../../src/lib/server/datasets/validateTable';
import type { ValidationIssue } from '../../../src/lib/server/datasets/types';
import { parseFile } from './helpers';

const issue = (code: string, message: string, row?: number, column?: string): ValidationIssue => ({
	code,
	message,
	...(row !== undefined ? { row } : {}),
	...(column !== undefined ? { column } : {})
});

describe('orderProblems', () => {
	test('table-wide problems first, then row by row: the row itself, its cells left to right, then repeats', () => {
		// given column by column, as the checks find them
		const found = [
			issue('empty-cell', 'b5', 5, 'b'),
			issue('non-numeric', 'b2', 2, 'b'),
			issue('no-output', 'no output'),
			issue('empty-cell', 'a5', 5, 'a'),
			issue('duplicate-inputs', 'dup 3', 3),
			issue('field-count', 'row 3 short', 3),
			issue('non-numeric', 'a9', 9, 'a'),
			issue('duplicate-column', 'dup col', undefined, 'a')
		];
		const { listed, count } = orderProblems(found, ['a', 'b']);
		expect(listed.map((e) => e.message)).toEqual(['no output', 'dup col', 'b2', 'row 3 short', 'dup 3', 'a5', 'b5', 'a9']);
		expect(count).toBe(8);
	});

	test('past the bound, the rest are counted by group in one closing note', () => {
		const found: ValidationIssue[] = [];
		for (let r = 2; r < 12; r++) found.push(issue('non-numeric', `a${r}`, r, 'a'));
		for (let r = 2; r < 12; r += 2) found.push(issue('field-count', `short ${r}`, r));
		const uncollected = new Map([['in column "a"', 7]]);
		const { listed, count } = orderProblems(found, ['a'], uncollected, 6);
		// rows 2..4 in order: field-count 2, a2, a3, field-count 4, a4, a5
		expect(listed.slice(0, 6).map((e) => e.message)).toEqual(['short 2', 'a2', 'a3', 'short 4', 'a4', 'a5']);
		expect(listed).toHaveLength(7);
		// left: a6..a11 (6) + 7 uncollected in "a"; field-count at 6, 8, 10 (3)
		expect(listed[6]).toEqual({
			code: 'more-problems',
			message: 'and 16 more problems not listed (3 rows with the wrong number of fields; 13 in column "a"); fix the ones above and check again to see them'
		});
		expect(count).toBe(15 + 7);
	});

	test('no note when everything is listed', () => {
		const { listed } = orderProblems([issue('empty-cell', 'x', 2, 'a')], ['a']);
		expect(listed).toEqual([issue('empty-cell', 'x', 2, 'a')]);
	});
});

describe('validateTable: one round for every kind of problem', () => {
	// rows 3 and 6 have the wrong number of fields; row 4 a word; rows 5 and 7 blank cells
	const CSV = ['J [-],eta [-],CT [-]', '0.1,0.30,0.095', '0.2,0.45', '0.3,n/a,0.080', '0.4,,0.072', '0.5,0.80,0.06,9', ',0.83,0.05', '0.7,0.84,0.04'].join('\n');

	test('wrong field counts, non-numeric cells and blank cells are all reported, in row order, naming row and column', async () => {
		const report = validateTable(await parseFile(CSV));
		expect(report.ok).toBe(false);
		expect(report.data).toBeUndefined();
		expect(report.errors.map((e) => [e.code, e.row, e.column])).toEqual([
			['field-count', 3, undefined],
			['non-numeric', 4, 'eta'],
			['empty-cell', 5, 'eta'],
			['field-count', 6, undefined],
			['empty-cell', 7, 'J']
		]);
		expect(report.errors.map((e) => e.message)).toEqual([
			'row 3 has 2 fields; the table has 3',
			'row 4, column "eta": "n/a" is not a number',
			'row 5, column "eta": the cell is empty',
			'row 6 has 4 fields; the table has 3',
			'row 7, column "J": the cell is empty'
		]);
		expect(report.problemCount).toBe(5);
	});

	test('the API error shape lists them all with row, column and the count', async () => {
		const body = reportErrorBody(validateTable(await parseFile(CSV)));
		expect(body.error.code).toBe('invalid-dataset');
		expect(body.error.message).toBe('the dataset has 5 problems; the first: row 3 has 2 fields; the table has 3');
		expect(body.error.details).toEqual([
			{ row: 3, problem: 'row 3 has 2 fields; the table has 3' },
			{ row: 4, column: 'eta', problem: 'row 4, column "eta": "n/a" is not a number' },
			{ row: 5, column: 'eta', problem: 'row 5, column "eta": the cell is empty' },
			{ row: 6, problem: 'row 6 has 4 fields; the table has 3' },
			{ row: 7, column: 'J', problem: 'row 7, column "J": the cell is empty' }
		]);
	});

	test('thousands of problems: the first 100 in row order are listed, the rest counted, values clipped', async () => {
		// 2,000 data rows (file rows 2..2001): every 3rd row short, every 5th a long word in "eta", every 7th a blank "CT"
		const long = 'w'.repeat(5000);
		const lines = ['J,eta,CT'];
		const expected: { row: number; code: string; column?: string }[] = [];
		for (let i = 0; i < 2000; i++) {
			const row = i + 2;
			if (i % 3 === 0) {
				lines.push(`${i},${i}`);
				expected.push({ row, code: 'field-count' });
				continue;
			}
			const eta = i % 5 === 0 ? long : String(i / 2000);
			const ct = i % 7 === 0 ? '' : String(i);
			lines.push(`${i},${eta},${ct}`);
			if (i % 5 === 0) expected.push({ row, code: 'non-numeric', column: 'eta' });
			if (i % 7 === 0) expected.push({ row, code: 'empty-cell', column: 'CT' });
		}
		const report = validateTable(await parseFile(lines.join('\n')));
		expect(report.problemCount).toBe(expected.length);
		const listed = report.errors.slice(0, -1);
		expect(listed.map((e) => ({ row: e.row, code: e.code, ...(e.column ? { column: e.column } : {}) }))).toEqual(expected.slice(0, 100));
		const left = expected.slice(100);
		const n = (pred: (e: (typeof left)[number]) => boolean) => left.filter(pred).length.toLocaleString('en-US');
		expect(report.errors.at(-1)!.message).toBe(
			`and ${left.length.toLocaleString('en-US')} more problems not listed (${n((e) => e.code === 'field-count')} rows with the wrong number of fields; ${n((e) => e.column === 'eta')} in column "eta"; ${n((e) => e.column === 'CT')} in column "CT"); fix the ones above and check again to see them`
		);
		const word = listed.find((e) => e.column === 'eta')!;
		expect(word.value).toBe(`${'w'.repeat(80)}… (5,000 characters)`);
		expect(word.message.length).toBeLessThan(200);
		const body = reportErrorBody(report);
		expect(body.error.details).toHaveLength(101);
		expect(body.error.message).toContain(`the dataset has ${expected.length.toLocaleString('en-US')} problems (the first 100 are listed)`);
		expect(JSON.stringify(body).length).toBeLessThan(40_000);
	});
});

describe('previewRows', () => {
	test('the first rows and every row with a problem, bad cells marked, left-out rows shown as read', async () => {
		const lines = ['x,y', ...Array.from({ length: 30 }, (_, i) => `${i},${i * i}`)];
		lines[12] = '11,eleven'; // file row 13
		lines[20] = '19'; // file row 21: one field
		lines[25] = '24,'; // file row 26: blank y
		const parsed = await parseFile(lines.join('\n'));
		const report = validateTable(parsed);
		const rows = previewRows(parsed, report.errors, { head: 3 });
		expect(rows.map((r) => r.row)).toEqual([2, 3, 4, 13, 21, 26]);
		expect(rows.map((r) => r.gapBefore)).toEqual([false, false, false, true, true, true]);
		expect(rows[0]).toEqual({ row: 2, cells: [0, 0], bad: null, problems: [], leftOut: false, gapBefore: false });
		expect(rows[3]).toMatchObject({ cells: [11, 'eleven'], bad: [null, '"eleven" is not a number'], problems: ['row 13, column "y": "eleven" is not a number'], leftOut: false });
		expect(rows[4]).toMatchObject({ cells: [19], bad: null, problems: ['row 21 has 1 field; the table has 2'], leftOut: true });
		expect(rows[5]).toMatchObject({ cells: [24, null], bad: [null, 'the cell is empty'] });
	});

	test('adjacent problem rows carry no gap; long cells are clipped; problem rows are bounded', async () => {
		const lines = ['x,y', '1,a', '2,b', '3,' + 'z'.repeat(1000), '4,4', '5,5'];
		const parsed = await parseFile(lines.join('\n'));
		const report = validateTable(parsed);
		const rows = previewRows(parsed, report.errors, { head: 0, problemRows: 2 });
		expect(rows.map((r) => [r.row, r.gapBefore])).toEqual([
			[2, false],
			[3, false]
		]);
		const all = previewRows(parsed, report.errors, { head: 0 });
		expect(all[2].cells[1]).toBe(`${'z'.repeat(80)}… (1,000 characters)`);
	});
});
