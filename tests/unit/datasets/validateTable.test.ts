import { describe, expect, test } from 'vitest';
import { parseTable } from '../../../src/lib/server/datasets/parseTable';
import { reportErrorBody } from '../../../src/lib/server/datasets/reportErrorBody';
import { validateTable } from '../../../src/lib/server/datasets/validateTable';
import type { Role } from '../../../src/lib/server/datasets/types';
import { parseFile } from './helpers';

async function check(text: string, roles?: Record<string, Role>, options?: { shape?: 'scatter' }) {
	return validateTable(await parseFile(text), roles, options);
}

/** "a,b\n" + rows of the 3 × 4 grid torque ∈ {10, 20, 30} × speed ∈ {1000, …, 4000}, eta invented. */
function motorGrid(skip: (torque: number, speed: number) => boolean = () => false): string {
	const lines = ['torque [N·m],speed [rpm],eta [-],loss [W]'];
	for (const speed of [1000, 2000, 3000, 4000]) {
		for (const torque of [10, 20, 30]) {
			if (skip(torque, speed)) continue;
			lines.push(`${torque},${speed},${(0.8 + torque / 1000 + speed / 1e5).toFixed(4)},${torque * 2 + speed / 100}`);
		}
	}
	return lines.join('\n');
}

describe('validateTable: cells', () => {
	test('non-numeric and empty cells name the row as seen in the file, the column and the value', async () => {
		const report = await check('J,eta,ct\n-,-,-\n0.1,0.42,0.11\n0.2,abc,0.10\n0.3,,0.09\n0.4,0.70,0.08\n');
		expect(report.ok).toBe(false);
		expect(report.data).toBeUndefined();
		expect(report.errors).toEqual([
			{ code: 'non-numeric', row: 4, column: 'eta', value: 'abc', message: 'row 4, column "eta": "abc" is not a number' },
			{ code: 'empty-cell', row: 5, column: 'eta', message: 'row 5, column "eta": the cell is empty' }
		]);
		// the input column is clean, so the shape is still told
		expect(report.shape).toBe('curve');
	});

	test('thousands separators and decimal commas are reported, not read', async () => {
		const report = await check('speed,power\n"1,500",2\n"12,500.5",3\n1 750,4\n2000,"4,5"\n"1.234,5",6\n');
		const byRow = Object.fromEntries(report.errors.map((e) => [e.row, e]));
		expect(byRow[2].code).toBe('thousands-separator');
		expect(byRow[2].message).toContain('write 1500 or 1.500');
		expect(byRow[3].code).toBe('thousands-separator');
		expect(byRow[4].code).toBe('thousands-separator');
		expect(byRow[4].value).toBe('1 750');
		expect(byRow[5]).toMatchObject({ code: 'decimal-comma', column: 'power', value: '4,5' });
		expect(byRow[5].message).toContain('write 4.5');
		expect(byRow[6]).toMatchObject({ code: 'thousands-separator', value: '1.234,5' });
	});

	test('a number too large for a double is reported', async () => {
		const report = await check('x,y\n1,2\n2,1e400\n');
		expect(report.errors).toEqual([
			{ code: 'non-numeric', row: 3, column: 'y', value: '1e400', message: 'row 3, column "y": "1e400" is out of range for a number' }
		]);
	});

	test('decimal point numbers with exponents are accepted', async () => {
		const report = await check('x,y\n-1e-3,+2.5E+2\n.5,5.\n2,-0.25e1\n');
		expect(report.errors).toEqual([]);
		expect(Array.from(report.data![0])).toEqual([-0.001, 0.5, 2]);
		expect(Array.from(report.data![1])).toEqual([250, 5, -2.5]);
	});

	test('a column of words is one error, not one per row', async () => {
		const report = await check('J,eta,comment\n0.1,0.4,ok\n0.2,0.5,ok\n0.3,0.6,retest\n');
		expect(report.errors).toHaveLength(1);
		expect(report.errors[0]).toMatchObject({ code: 'text-column', column: 'comment' });
		expect(report.errors[0].message).toContain('"ok", "ok", "retest"');
	});

	test('many bad cells are listed up to a cap, then counted', async () => {
		const rows = Array.from({ length: 300 }, (_, i) => `${i},${i % 2 ? 'x' : i}`);
		const report = await check(['a,b', ...rows].join('\n'));
		expect(report.errors.filter((e) => e.code === 'non-numeric')).toHaveLength(100);
		expect(report.problemCount).toBe(150);
		expect(report.errors.at(-1)).toMatchObject({ code: 'more-problems' });
		expect(report.errors.at(-1)!.message).toBe('and 50 more problems not listed (50 in column "b"); fix the ones above and check again to see them');
	});
});

describe('validateTable: roles and inputs', () => {
	test('by default the first column is the input and the rest outputs', async () => {
		const report = await check('J [-],eta [-],ct [-]\n0.1,0.42,0.11\n0.2,0.55,0.10\n0.3,0.63,0.09\n');
		expect(report.ok).toBe(true);
		expect(report.columns).toEqual([
			{ name: 'J', unit: '-', role: 'input' },
			{ name: 'eta', unit: '-', role: 'output' },
			{ name: 'ct', unit: '-', role: 'output' }
		]);
		expect(report.rowCount).toBe(3);
		expect(report.data!.map((d) => d.constructor.name)).toEqual(['Float64Array', 'Float64Array', 'Float64Array']);
	});

	test('a roles map naming a missing column, and a table without an output', async () => {
		const report = await check('x,y\n1,2\n2,3\n3,1\n4,5\n', { x: 'input', y: 'input', z: 'output' });
		expect(report.errors.map((e) => e.code)).toEqual(['unknown-column', 'no-output']);
		expect(report.errors[0].message).toContain('"z"');
	});

	test('a single column has no output', async () => {
		const report = await check('x\n1\n2\n');
		expect(report.errors.map((e) => e.code)).toEqual(['no-output']);
	});

	test('duplicate column names', async () => {
		const report = await check('T,T,p\n1,2,3\n2,3,4\n');
		expect(report.errors[0]).toMatchObject({ code: 'duplicate-column', column: 'T' });
	});

	test('an input column of all-equal values is an error', async () => {
		const report = await check('torque,speed,eta\n10,3000,0.8\n20,3000,0.85\n30,3000,0.83\n', { torque: 'input', speed: 'input' });
		expect(report.ok).toBe(false);
		expect(report.errors).toEqual([
			{
				code: 'constant-input',
				column: 'speed',
				value: '3000',
				message: 'input column "speed" has the same value (3000) in every row; an input must vary'
			}
		]);
	});

	test('duplicate input points list their rows', async () => {
		const report = await check('J,eta\n0.1,0.4\n0.2,0.5\n0.1,0.41\n0.3,0.6\n0.2,0.52\n0.1,0.39\n');
		const dupes = report.errors.filter((e) => e.code === 'duplicate-inputs');
		expect(dupes.map((e) => e.message)).toEqual([
			'rows 2, 4 and 7 have the same inputs (J = 0.1); each input point may appear only once',
			'rows 3 and 6 have the same inputs (J = 0.2); each input point may appear only once'
		]);
	});

	test('duplicate points on several inputs', async () => {
		const report = await check(motorGrid() + '\n20,3000,0.9,1', { torque: 'input', speed: 'input' });
		const dupe = report.errors.find((e) => e.code === 'duplicate-inputs')!;
		expect(dupe.message).toContain('torque = 20, speed = 3000');
		expect(dupe.row).toBe(14);
	});
});

describe('validateTable: shape', () => {
	test('an unsorted curve is fine, with a note', async () => {
		const report = await check('J,eta\n0.3,0.6\n0.1,0.4\n0.2,0.5\n');
		expect(report.ok).toBe(true);
		expect(report.shape).toBe('curve');
		expect(report.shapeReason).toBe('one input column ("J"), so the data are a curve');
		expect(report.notes).toContain('rows are not sorted by "J"; that is fine, row order does not matter');
		expect(Array.from(report.data![0])).toEqual([0.3, 0.1, 0.2]);
	});

	test('a sorted curve gets no such note', async () => {
		const report = await check('J,eta\n0.1,0.4\n0.2,0.5\n');
		expect(report.notes.some((n) => n.includes('sorted'))).toBe(false);
	});

	test('a curve needs two rows', async () => {
		const report = await check('J,eta\n0.1,0.4\n');
		expect(report.errors).toEqual([{ code: 'too-few-rows', message: 'the table has 1 data row; a dataset needs at least 2' }]);
	});

	test('a 3 × 4 grid is detected as a grid', async () => {
		const report = await check(motorGrid(), { torque: 'input', speed: 'input' });
		expect(report.errors).toEqual([]);
		expect(report.ok).toBe(true);
		expect(report.shape).toBe('grid');
		expect(report.shapeReason).toBe(
			'every combination of the input values "torque" (3 values), "speed" (4 values) appears: a full 3 × 4 grid of 12 points'
		);
		expect(report.columns.map((c) => c.role)).toEqual(['input', 'input', 'output', 'output']);
		// speed varies slowest in the file: sorted by (speed, torque) counts as sorted
		expect(report.notes.some((n) => n.includes('sorted'))).toBe(false);
	});

	test('a shuffled grid is still a grid, with a note on the order', async () => {
		const [header, ...rows] = motorGrid().split('\n');
		const shuffled = [header, ...rows.map((r, i) => rows[(i * 5) % rows.length])].join('\n');
		const report = await check(shuffled, { torque: 'input', speed: 'input' });
		expect(report.ok).toBe(true);
		expect(report.shape).toBe('grid');
		expect(report.notes).toContain('rows are not sorted by ("torque", "speed"); that is fine, row order does not matter');
	});

	test('a grid with a missing cell names the missing combination', async () => {
		const report = await check(
			motorGrid((t, s) => t === 20 && s === 3000),
			{ torque: 'input', speed: 'input' }
		);
		expect(report.ok).toBe(false);
		expect(report.shape).toBe('grid');
		expect(report.errors).toEqual([
			{
				code: 'grid-missing-points',
				message:
					'the inputs look like a 3 × 4 grid, but 1 of its 12 points is missing: (torque = 20, speed = 3000); add the missing rows, or treat the table as scattered points (shape "scatter")'
			}
		]);
	});

	test('a grid with a missing cell taken as scattered points when asked, the cell still named', async () => {
		const report = await check(
			motorGrid((t, s) => t === 20 && s === 3000),
			{ torque: 'input', speed: 'input' },
			{ shape: 'scatter' }
		);
		expect(report.ok).toBe(true);
		expect(report.shape).toBe('scatter');
		expect(report.shapeReason).toBe('taken as scattered points, as asked: the values "torque" (3 values), "speed" (4 values) nearly fill a 3 × 4 grid (11 of 12 points)');
		expect(report.notes).toContain('the inputs nearly fill a 3 × 4 grid (1 of 12 points missing: (torque = 20, speed = 3000)); taken as scattered points, as asked (shape "scatter")');
	});

	test('a full grid taken as scattered points when asked', async () => {
		const report = await check(motorGrid(), { torque: 'input', speed: 'input' }, { shape: 'scatter' });
		expect(report.ok).toBe(true);
		expect(report.shape).toBe('scatter');
		expect(report.shapeReason).toMatch(/^taken as scattered points, as asked: .* form a full 3 × 4 grid \(12 of 12 points\)$/);
	});

	test('a grid missing several cells lists them', async () => {
		const report = await check(
			motorGrid((t, s) => (t === 10 && s === 1000) || (t === 30 && s === 4000)),
			{ torque: 'input', speed: 'input' }
		);
		expect(report.errors[0].message).toContain('2 of its 12 points are missing: (torque = 10, speed = 1000), (torque = 30, speed = 4000)');
	});

	test('scattered points are detected as scatter', async () => {
		// lift and drag at invented (alpha, Re) test points, no two sharing a grid
		const report = await check(
			'alpha [deg],Re [-],CL [-]\n0,1e5,0.1\n2,2e5,0.3\n4,1.5e5,0.5\n6,3e5,0.7\n8,2.5e5,0.85\n',
			{ alpha: 'input', Re: 'input' }
		);
		expect(report.ok).toBe(true);
		expect(report.shape).toBe('scatter');
		expect(report.shapeReason).toBe(
			'the 5 input points do not form a grid: the values "alpha" (5 values), "Re" (5 values) would make 25 combinations'
		);
	});

	test('scatter needs inputs + 2 rows', async () => {
		const report = await check('a,b,c,y\n1,2,3,0\n2,1,5,1\n3,4,4,2\n4,3,1,3\n', { a: 'input', b: 'input', c: 'input' });
		expect(report.shape).toBe('scatter');
		expect(report.errors).toEqual([
			{ code: 'too-few-rows', message: 'scattered data with 3 inputs need at least 5 rows; the table has 4' }
		]);
	});

	test('non-numeric inputs leave the shape untold', async () => {
		const report = await check('J,eta\n0.1,0.4\nx,0.5\n0.3,0.6\n');
		expect(report.shape).toBeNull();
		expect(report.shapeReason).toContain('once every input cell holds a number');
	});

	test('a constant output is a warning only', async () => {
		const report = await check('J,eta\n0.1,0.5\n0.2,0.5\n');
		expect(report.ok).toBe(true);
		expect(report.warnings).toContain('output column "eta" has the same value (0.5) in every row');
	});
});

describe('reportErrorBody', () => {
	test('gives the API error shape with row, column and problem', async () => {
		const report = validateTable(await parseTable({ text: 'x,y\n1,a\n2,3\n2,4\n' }));
		expect(reportErrorBody(report)).toEqual({
			error: {
				code: 'invalid-dataset',
				message: 'the dataset has 2 problems; the first: row 2, column "y": "a" is not a number',
				details: [
					{ row: 2, column: 'y', problem: 'row 2, column "y": "a" is not a number' },
					{ row: 4, problem: 'rows 3 and 4 have the same inputs (x = 2); each input point may appear only once' }
				]
			}
		});
	});
});
