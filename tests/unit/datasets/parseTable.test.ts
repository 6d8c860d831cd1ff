import { describe, expect, test } from 'vitest';
import { parseTable } from '../../../src/lib/server/datasets/parseTable';
import { bytesOf, expectDatasetError, parseFile, pseudoRandomBytes, workbookBytes } from './helpers';

describe('parseTable: files that cannot be read', () => {
	test('an empty file', async () => {
		await expectDatasetError(parseTable({ bytes: new Uint8Array(0), filename: 'props.csv' }), 'empty', 'the file is empty');
	});

	test('a file holding only a BOM and blank lines is empty', async () => {
		await expectDatasetError(parseFile('\uFEFF\n  \r\n\n'), 'empty', 'empty');
	});

	test('binary content renamed .csv (NUL bytes)', async () => {
		const bytes = pseudoRandomBytes(4096, 7);
		bytes[10] = 0;
		const error = await expectDatasetError(parseTable({ bytes, filename: 'motor.csv' }), 'not-text', 'not a text table', 'NUL');
		expect(error.status).toBe(422);
		expect(error.body()).toEqual({ error: { code: 'not-text', message: error.message } });
	});

	test('binary content without NULs but mostly invalid UTF-8', async () => {
		// only bytes 0x80–0xFF: no control characters, almost none valid UTF-8
		const bytes = pseudoRandomBytes(4096, 11, (b) => 0x80 | b);
		await expectDatasetError(parseTable({ bytes, filename: 'motor.csv' }), 'not-text', 'not valid UTF-8');
	});

	test('a PNG renamed .csv', async () => {
		const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
		await expectDatasetError(parseTable({ bytes: png, filename: 'curve.csv' }), 'not-text');
	});

	test('a legacy .xls workbook is refused with advice', async () => {
		const ole = new Uint8Array([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, 0, 0, 0, 0]);
		await expectDatasetError(parseTable({ bytes: ole, filename: 'map.xls' }), 'unsupported-format', '.xls', 'save it as .xlsx or CSV');
	});

	test('header only', async () => {
		await expectDatasetError(parseFile('J,eta\n'), 'no-rows', 'header (J, eta)', 'no data rows');
	});

	test('header and units row but no data', async () => {
		await expectDatasetError(parseFile('J,eta\n-,-\n'), 'no-rows', 'no data rows');
	});

	test('rows in another delimiter are left out and named; the rest is read', async () => {
		const text = ['J,eta,ct', '0.1,0.42,0.11', '0.2;0.55;0.10', '0.3,0.63,0.09', '0.4;0.70;0.08', '0.5,0.74,0.07'].join('\n');
		const parsed = await parseFile(text);
		expect(parsed.rowNumbers).toEqual([2, 4, 6]);
		expect(parsed.badRowCount).toBe(2);
		expect(parsed.badRows).toEqual([
			{ row: 3, code: 'mixed-delimiters', problem: "uses ';' as the delimiter instead of ','", cells: ['0.2;0.55;0.10'] },
			{ row: 5, code: 'mixed-delimiters', problem: "uses ';' as the delimiter instead of ','", cells: ['0.4;0.70;0.08'] }
		]);
	});

	test('a header in another delimiter than every data row stops the read, naming the rows', async () => {
		const text = ['J;eta;ct', '0.1,0.42,0.11', '0.2,0.55,0.10'].join('\n');
		const error = await expectDatasetError(parseFile(text), 'mixed-delimiters', 'row 1', "';'", "','");
		expect(error.details).toEqual([{ row: 1, problem: "uses ';' as the delimiter instead of ','" }]);
	});

	test('mixed delimiters in pasted text, decimal commas and all', async () => {
		const text = 'J;eta\n0.1;0.4\n0.2;0.5\n0,3;0,6\n0.4;0.7\n';
		// "0,3;0,6" still splits at ';' into two fields, so it is a cell problem, not a delimiter one
		const parsed = await parseTable({ text });
		expect(parsed.delimiter).toBe(';');
		expect(parsed.rows[2]).toEqual(['0,3', '0,6']);
	});

	test('a row with a missing field or an extra one is left out and named, its cells kept as read', async () => {
		const parsed = await parseFile('x,y,z\n1,2,3\n4,5\n7,8,9\n10,11,12,13\n');
		expect(parsed.rows).toEqual([
			[1, 2, 3],
			[7, 8, 9]
		]);
		expect(parsed.rowNumbers).toEqual([2, 4]);
		expect(parsed.badRows).toEqual([
			{ row: 3, code: 'field-count', problem: 'has 2 fields; the table has 3', cells: [4, 5] },
			{ row: 5, code: 'field-count', problem: 'has 4 fields; the table has 3', cells: [10, 11, 12, 13] }
		]);
	});

	test('a header with the wrong number of fields stops the read (no columns to read the rows into)', async () => {
		const error = await expectDatasetError(parseFile('x,y,z,w\n1,2,3\n4,5,6\n7,8,9\n'), 'field-count', 'row 1', 'has 4 fields');
		expect(error.details).toEqual([{ row: 1, problem: 'has 4 fields; the table has 3' }]);
	});

	test('every data row with the wrong number of fields stops the read, naming them (not "no data rows")', async () => {
		const error = await expectDatasetError(parseFile('x,y,z\n-,-,-\n1,2\n3,4,5,6\n'), 'field-count', 'rows 3 and 4');
		expect(error.details).toEqual([
			{ row: 3, problem: 'has 2 fields; the table has 3' },
			{ row: 4, problem: 'has 4 fields; the table has 3' }
		]);
	});

	test('an unclosed quote is named', async () => {
		await expectDatasetError(parseFile('x,y\n1,2\n3,"4\n'), 'malformed-quotes', 'row 3', 'never closed');
	});
});

describe('parseTable: CSV and TSV that read', () => {
	test('units in the header, both styles; BOM, CRLF and spaces handled', async () => {
		const parsed = await parseFile('\uFEFFtorque [N·m] , speed (rpm), eta\r\n 1.5 ,1000, 0.81\r\n2,1000,0.84\r\n');
		expect(parsed.format).toBe('csv');
		expect(parsed.hasHeader).toBe(true);
		expect(parsed.columns).toEqual([
			{ name: 'torque', unit: 'N·m' },
			{ name: 'speed', unit: 'rpm' },
			{ name: 'eta', unit: null }
		]);
		// plain decimal numbers become numbers as they are read
		expect(parsed.rows).toEqual([
			[1.5, 1000, 0.81],
			[2, 1000, 0.84]
		]);
		expect(parsed.rowNumbers).toEqual([2, 3]);
	});

	test('a units row after the header', async () => {
		const parsed = await parseFile('J,eta,torque,power\n-,%,N·m,kW\n0.1,42,1.5,0.3\n0.2,55,1.4,0.35\n');
		expect(parsed.columns.map((c) => c.unit)).toEqual(['-', '%', 'N·m', 'kW']);
		expect(parsed.rowNumbers).toEqual([3, 4]);
		expect(parsed.notes).toContain('row 2 was read as units: -, %, N·m, kW');
	});

	test('a units row disagreeing with a header unit keeps the header and warns', async () => {
		const parsed = await parseFile('T [K],p\nC,bar\n300,1\n310,1.1\n');
		expect(parsed.columns).toEqual([
			{ name: 'T', unit: 'K' },
			{ name: 'p', unit: 'bar' }
		]);
		expect(parsed.warnings[0]).toContain('"K" in its header but "C" in the units row');
	});

	test('TSV by file name and by detection', async () => {
		const text = 'SoC [%]\tV [V]\n0\t3.0\n50\t3.7\n100\t4.2\n';
		const fromFile = await parseFile(text, 'pack.tsv');
		expect(fromFile.format).toBe('tsv');
		expect(fromFile.delimiter).toBe('\t');
		expect(fromFile.columns).toEqual([
			{ name: 'SoC', unit: '%' },
			{ name: 'V', unit: 'V' }
		]);
		const pasted = await parseTable({ text });
		expect(pasted.format).toBe('tsv');
		expect(pasted.rows).toHaveLength(3);
	});

	test('a tab-separated file named .csv is read, with a note', async () => {
		const parsed = await parseFile('a\tb\n1\t2\n3\t4\n', 'export.csv');
		expect(parsed.delimiter).toBe('\t');
		expect(parsed.notes).toContain("columns are separated by tab, not ','");
	});

	test('semicolon-separated text is detected', async () => {
		const parsed = await parseFile('CL;CD\n0.2;0.011\n0.4;0.013\n0.6;0.017\n');
		expect(parsed.delimiter).toBe(';');
		expect(parsed.columns.map((c) => c.name)).toEqual(['CL', 'CD']);
	});

	test('cells that are not plain numbers stay text, trimmed', async () => {
		const parsed = await parseFile('x,y\n 1 , n/a \n2,"1,500"\n3,1e400\n');
		expect(parsed.rows).toEqual([
			[1, 'n/a'],
			[2, '1,500'],
			[3, '1e400']
		]);
	});

	test('an explicit delimiter overrides detection', async () => {
		const parsed = await parseTable({ text: 'a|b\n1|2\n', delimiter: '|' });
		expect(parsed.rows).toEqual([[1, 2]]);
	});

	test('without a header the columns are named col1…', async () => {
		const parsed = await parseFile('0.1,0.42\n0.2,0.55\n0.3,0.63\n');
		expect(parsed.hasHeader).toBe(false);
		expect(parsed.columns.map((c) => c.name)).toEqual(['col1', 'col2']);
		expect(parsed.rowNumbers).toEqual([1, 2, 3]);
		expect(parsed.notes[0]).toContain('col1…col2');
	});

	test('blank lines are skipped but row numbers stay those of the file', async () => {
		const parsed = await parseFile('x,y\n1,2\n\n3,4\n,\n5,6\n\n');
		expect(parsed.rowNumbers).toEqual([2, 4, 6]);
		expect(parsed.notes).toContain('skipped blank rows 3 and 5');
	});

	test('a trailing delimiter on every row adds no column', async () => {
		const parsed = await parseFile('x,y,\n1,2,\n3,4,\n');
		expect(parsed.columns.map((c) => c.name)).toEqual(['x', 'y']);
		expect(parsed.rows).toEqual([
			[1, 2],
			[3, 4]
		]);
	});

	test('an empty spacer column is dropped with a note', async () => {
		const parsed = await parseFile('x,,y\n1,,2\n3,,4\n');
		expect(parsed.columns.map((c) => c.name)).toEqual(['x', 'y']);
		expect(parsed.notes).toContain('ignored an empty column: column 2');
	});

	test('Windows-1252 text reads, with a note', async () => {
		// "T [°C]" with ° as the single byte 0xB0
		const bytes = new Uint8Array([...bytesOf('T ['), 0xb0, ...bytesOf('C],rho\n20,998\n40,992\n')]);
		const parsed = await parseTable({ bytes, filename: 'water.csv' });
		expect(parsed.columns[0]).toEqual({ name: 'T', unit: '°C' });
		expect(parsed.notes.join(' ')).toContain('Windows-1252');
	});

	test('an XLSX workbook named .csv is read as a workbook', async () => {
		const bytes = await workbookBytes((wb) => {
			const ws = wb.addWorksheet('Sheet1');
			ws.addRow(['J', 'eta']);
			ws.addRow([0.1, 0.4]);
		});
		const parsed = await parseTable({ bytes, filename: 'prop.csv' });
		expect(parsed.format).toBe('xlsx');
		expect(parsed.notes).toContain('"prop.csv" is an XLSX workbook despite its name, and was read as one');
	});

	test('a file named .xlsx that is not a workbook', async () => {
		await expectDatasetError(parseFile('a,b\n1,2\n', 'map.xlsx'), 'unreadable-workbook', 'not an XLSX file');
	});
});
