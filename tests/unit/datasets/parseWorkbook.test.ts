import { describe, expect, test } from 'vitest';
import { columnLetter } from '../../../src/lib/server/datasets/parseWorkbook';
import { parseTable } from '../../../src/lib/server/datasets/parseTable';
import { validateTable } from '../../../src/lib/server/datasets/validateTable';
import { expectDatasetError, handWrittenSheet, workbookBytes } from './helpers';

/** A workbook with a notes sheet holding nothing, then two sheets of data. */
function severalSheets() {
	return workbookBytes((wb) => {
		wb.addWorksheet('Notes');
		const prop = wb.addWorksheet('Propeller');
		prop.addRow(['J [-]', 'eta [-]']);
		[
			[0.1, 0.42],
			[0.2, 0.55],
			[0.3, 0.63]
		].forEach((r) => prop.addRow(r));
		const pack = wb.addWorksheet('Pack');
		pack.addRow(['SoC', 'V']);
		pack.addRow(['%', 'V']);
		[
			[0, 3.0],
			[50, 3.7],
			[100, 4.2]
		].forEach((r) => pack.addRow(r));
	});
}

describe('parseTable: XLSX', () => {
	test('several sheets: the first with data is used, and the note says which', async () => {
		const parsed = await parseTable({ bytes: await severalSheets(), filename: 'larkmoor.xlsx' });
		expect(parsed.format).toBe('xlsx');
		expect(parsed.sheet).toBe('Propeller');
		expect(parsed.sheets).toEqual(['Notes', 'Propeller', 'Pack']);
		expect(parsed.notes).toContain('used sheet "Propeller", the first sheet with data; the workbook has sheets "Notes", "Propeller", "Pack"');
		expect(parsed.columns).toEqual([
			{ name: 'J', unit: '-' },
			{ name: 'eta', unit: '-' }
		]);
		expect(parsed.rows).toEqual([
			[0.1, 0.42],
			[0.2, 0.55],
			[0.3, 0.63]
		]);
		expect(validateTable(parsed).ok).toBe(true);
	});

	test('the requested sheet is used, with its units row', async () => {
		const parsed = await parseTable({ bytes: await severalSheets(), filename: 'larkmoor.xlsx', sheet: 'Pack' });
		expect(parsed.sheet).toBe('Pack');
		expect(parsed.notes[0]).toBe('used sheet "Pack" as requested; the workbook has sheets "Notes", "Propeller", "Pack"');
		expect(parsed.columns).toEqual([
			{ name: 'SoC', unit: '%' },
			{ name: 'V', unit: 'V' }
		]);
		expect(parsed.rowNumbers).toEqual([3, 4, 5]);
	});

	test('a sheet that does not exist is named, with the sheets there are', async () => {
		await expectDatasetError(
			async () => parseTable({ bytes: await severalSheets(), filename: 'larkmoor.xlsx', sheet: 'Motor' }),
			'sheet-not-found',
			'no sheet "Motor"',
			'"Notes", "Propeller", "Pack"'
		);
	});

	test('a workbook with no data on any sheet is empty', async () => {
		const bytes = await workbookBytes((wb) => {
			wb.addWorksheet('A');
			wb.addWorksheet('B');
		});
		await expectDatasetError(parseTable({ bytes, filename: 'blank.xlsx' }), 'empty', 'no data on any sheet', '"A", "B"');
	});

	test('formula cells give their saved values, and the note names them', async () => {
		const bytes = await workbookBytes((wb) => {
			const ws = wb.addWorksheet('Motor');
			ws.addRow(['torque [N·m]', 'speed [rpm]', 'power [W]']);
			// power = torque · speed · 2π/60, saved results as a spreadsheet program would store them
			const rows: [number, number][] = [
				[10, 1000],
				[20, 1500],
				[30, 2000]
			];
			rows.forEach(([t, s], i) => {
				const r = i + 2;
				ws.addRow([t, s, { formula: `A${r}*B${r}*2*PI()/60`, result: (t * s * 2 * Math.PI) / 60 }]);
			});
			ws.getCell('E2').value = { formula: 'SUM(C2:C4)', result: 0 };
			ws.getCell('E1').value = 'total';
		});
		const parsed = await parseTable({ bytes, filename: 'motor.xlsx' });
		expect(parsed.notes).toContain('4 cells are formulas; their saved values were used: C2:C4, E2');
		expect(parsed.rows[1][2]).toBeCloseTo((20 * 1500 * 2 * Math.PI) / 60, 12);
		// column D is empty and dropped
		expect(parsed.columns.map((c) => c.name)).toEqual(['torque', 'speed', 'power', 'total']);
		expect(parsed.notes).toContain('ignored an empty column: column D');
	});

	test('a formula with no saved value is an error naming the cell', async () => {
		const bytes = await workbookBytes((wb) => {
			const ws = wb.addWorksheet('Prop');
			ws.addRow(['J', 'eta']);
			ws.addRow([0.1, 0.4]);
			ws.addRow([0.2, { formula: 'B2*1.1' }]);
		});
		const error = await expectDatasetError(
			parseTable({ bytes, filename: 'prop.xlsx' }),
			'formula-without-value',
			'a formula cell has no saved value (B3)',
			'save it'
		);
		expect(error.details).toEqual([{ row: 3, column: 'B', problem: 'B3 holds the formula =B2*1.1 but no saved value' }]);
	});

	test('a formula whose saved value is an error shows up as a bad cell', async () => {
		const bytes = await workbookBytes((wb) => {
			const ws = wb.addWorksheet('Prop');
			ws.addRow(['J', 'eta']);
			ws.addRow([0.1, 0.4]);
			ws.addRow([0.2, { formula: '1/0', result: { error: '#DIV/0!' } }]);
			ws.addRow([0.3, 0.6]);
		});
		const report = validateTable(await parseTable({ bytes, filename: 'prop.xlsx' }));
		expect(report.errors).toEqual([
			// the streaming reader keeps that the saved value is an error, not which one
			{ code: 'non-numeric', row: 3, column: 'eta', value: 'an error (=1/0)', message: 'row 3, column "eta": "an error (=1/0)" is not a number' }
		]);
	});

	test('rows keep their sheet row numbers across blank rows', async () => {
		const bytes = await workbookBytes((wb) => {
			const ws = wb.addWorksheet('S');
			ws.getCell('A1').value = 'x';
			ws.getCell('B1').value = 'y';
			ws.getCell('A2').value = 1;
			ws.getCell('B2').value = 2;
			ws.getCell('A5').value = 3;
			ws.getCell('B5').value = 'n/a';
		});
		const parsed = await parseTable({ bytes, filename: 's.xlsx' });
		expect(parsed.rowNumbers).toEqual([2, 5]);
		const report = validateTable(parsed);
		expect(report.errors[0]).toMatchObject({ row: 5, column: 'y', value: 'n/a' });
	});

	test('a damaged workbook', async () => {
		const bytes = (await severalSheets()).slice(0, 200);
		await expectDatasetError(parseTable({ bytes, filename: 'broken.xlsx' }), 'unreadable-workbook', 'could not be read as an XLSX workbook');
	});
});


describe('parseTable: XLSX read as a stream, stopping at the limits', () => {
	test('a workbook that lies about its sizes is stopped at the row limit as it is reached', async () => {
		// 1,000,010 data rows: over the limit of 1,000,000 (+ header and units rows), declared as 1 KB
		const bytes = await handWrittenSheet(1_000_010, { lie: true });
		await expectDatasetError(parseTable({ bytes, filename: 'liar.xlsx' }), 'too-many-rows', 'more than 1,000,000 rows', 'the limit is 1,000,000 rows');
	}, 120_000);

	test('a stray cell far to the right stops reading and is named', async () => {
		const bytes = await handWrittenSheet(3, { extra: '<row r="9"><c r="XFD9"><v>7</v></c></row>' });
		const e = await expectDatasetError(parseTable({ bytes, filename: 'far.xlsx' }), 'too-many-columns', 'cell XFD9 on sheet "Sweep" lies beyond column IV');
		expect(e.details).toEqual([{ row: 9, column: 'XFD', problem: 'beyond column IV' }]);
	});

	test('a 33rd used column stops reading at the column limit', async () => {
		const cells = Array.from({ length: 33 }, (_, j) => `<c r="${columnLetter(j + 2)}5"><v>${j}</v></c>`).join('');
		const bytes = await handWrittenSheet(3, { extra: `<row r="5">${cells}</row>` });
		await expectDatasetError(parseTable({ bytes, filename: 'wide.xlsx' }), 'too-many-columns', 'table has more than 32 columns; the limit is 32 columns');
	});

	test('empty columns between used ones are dropped and named, with their letters', async () => {
		const bytes = await handWrittenSheet(3, { extra: '<row r="20"><c r="A20"><v>9</v></c><c r="B20"><v>1</v></c><c r="F20"><v>4</v></c></row>' });
		const parsed = await parseTable({ bytes, filename: 'gap.xlsx' });
		// F has no header cell, so it gets the usual placeholder name for its position
		expect(parsed.columns.map((c) => c.name)).toEqual(['x', 'y', 'col3']);
		expect(parsed.rows[3]).toEqual([9, 1, 4]);
		expect(parsed.rowNumbers).toEqual([2, 3, 4, 20]);
		expect(parsed.notes).toContain('ignored empty columns: column C, column D, column E');
	});

	test('cells without addresses (allowed by OOXML, not by this reader) get a plain message, not the reader’s', async () => {
		const bytes = await handWrittenSheet(5, { addressed: false });
		await expectDatasetError(parseTable({ bytes, filename: 'bare.xlsx' }), 'unreadable-workbook', 'such as cells without an address');
	});
});
