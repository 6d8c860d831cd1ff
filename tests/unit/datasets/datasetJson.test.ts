import { describe, expect, test } from 'vitest';
import { datasetJsonSchema } from '../../../src/lib/server/datasets/datasetJsonSchema';
import { sha256 } from '../../../src/lib/server/tokens';
import { parseDatasetJson, tableFromJson } from '../../../src/lib/server/datasets/tableFromJson';
import { validateTable } from '../../../src/lib/server/datasets/validateTable';
import { expectDatasetError } from './helpers';

const propeller = {
	name: 'Propeller 14×7, static and cruise',
	columns: [
		{ name: 'J', unit: '-', role: 'input' },
		{ name: 'eta', role: 'output' }
	],
	rows: [
		[0.1, 0.42],
		[0.3, 0.63],
		[0.2, 0.55]
	]
};

describe('JSON dataset body', () => {
	test('a good body becomes the same ParsedTable and validates', () => {
		const { name, table } = parseDatasetJson(propeller);
		expect(name).toBe('Propeller 14×7, static and cruise');
		expect(table.format).toBe('json');
		expect(table.columns).toEqual([
			{ name: 'J', unit: '-', role: 'input' },
			{ name: 'eta', unit: null, role: 'output' }
		]);
		expect(table.rowNumbers).toEqual([1, 2, 3]);
		const report = validateTable(table);
		expect(report.ok).toBe(true);
		expect(report.shape).toBe('curve');
		expect(report.notes).toContain('rows are not sorted by "J"; that is fine, row order does not matter');
	});

	test('roles come from the body; a roles map still overrides them', () => {
		const table = tableFromJson(
			datasetJsonSchema.parse({
				name: 'motor',
				columns: [
					{ name: 'torque', role: 'input' },
					{ name: 'speed', role: 'output' },
					{ name: 'eta', role: 'output' }
				],
				rows: [10, 20].flatMap((t) => [1000, 2000, 3000].map((s) => [t, s, 0.8 + t / 1000 + s / 1e5]))
			})
		);
		expect(validateTable(table).shape).toBe('curve');
		const asGrid = validateTable(table, { speed: 'input' });
		expect(asGrid.ok).toBe(true);
		expect(asGrid.shape).toBe('grid');
	});

	test('the name must be 1 to 120 characters', async () => {
		const empty = await expectDatasetError(() => parseDatasetJson({ ...propeller, name: '  ' }), 'invalid-body', 'name: name cannot be empty');
		expect(empty.details).toEqual([{ field: 'name', problem: 'name cannot be empty' }]);
		await expectDatasetError(() => parseDatasetJson({ ...propeller, name: 'x'.repeat(121) }), 'invalid-body', 'name can be at most 120 characters');
		await expectDatasetError(() => parseDatasetJson({ ...propeller, name: undefined }), 'invalid-body', 'name is required');
	});

	test('a row of the wrong length is named', async () => {
		const error = await expectDatasetError(
			() => parseDatasetJson({ ...propeller, rows: [[0.1, 0.4], [0.2], [0.3, 0.6, 9]] }),
			'invalid-body',
			'row 2 has 1 value; there are 2 columns',
			'(and 1 more problems)'
		);
		expect(error.details).toEqual([
			{ row: 2, problem: 'row 2 has 1 value; there are 2 columns' },
			{ row: 3, problem: 'row 3 has 3 values; there are 2 columns' }
		]);
	});

	test('a cell that is not a number names its row and column', async () => {
		const error = await expectDatasetError(
			() => parseDatasetJson({ ...propeller, rows: [[0.1, 0.4], [0.2, '0.5']] }),
			'invalid-body',
			'row 2, column "eta": each cell must be a finite number'
		);
		expect(error.details[0]).toMatchObject({ row: 2, column: 'eta' });
	});

	test('columns: at least one, roles spelled right, names unique', async () => {
		await expectDatasetError(() => parseDatasetJson({ ...propeller, columns: [] }), 'invalid-body', 'columns: a dataset needs at least 1 column');
		const role = await expectDatasetError(
			() => parseDatasetJson({ ...propeller, columns: [{ name: 'J', role: 'in' }, propeller.columns[1]] }),
			'invalid-body',
			'a column role must be "input" or "output"'
		);
		expect(role.details[0].field).toBe('columns[0].role');
		await expectDatasetError(
			() => parseDatasetJson({ ...propeller, columns: [propeller.columns[0], { name: 'J', role: 'output' }] }),
			'invalid-body',
			'column name "J" is used twice'
		);
	});

	test('a body that is not an object', async () => {
		await expectDatasetError(() => parseDatasetJson(null), 'invalid-body');
		await expectDatasetError(() => parseDatasetJson([1, 2]), 'invalid-body');
	});

	test('the schema alone gives the same messages', () => {
		const result = datasetJsonSchema.safeParse({ ...propeller, rows: [[1]] });
		expect(result.success).toBe(false);
		expect(result.error!.issues[0]).toMatchObject({ path: ['rows', 0], message: 'row 1 has 1 value; there are 2 columns' });
	});
});

describe('sha256', () => {
	test('matches the FIPS 180-2 test vector for "abc"', () => {
		// FIPS 180-2, appendix B.1
		const expected = 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad';
		expect(sha256('abc')).toBe(expected);
		expect(sha256(new Uint8Array([0x61, 0x62, 0x63]))).toBe(expected);
	});
});
