import { describe, expect, test } from 'vitest';
import { parseTable } from '../../../src/lib/server/datasets/parseTable';
import { validateTable } from '../../../src/lib/server/datasets/validateTable';
import { expectDatasetError, workbookBytes } from './helpers';

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
			{ code: 'non-numeric', row: 3, column: 'eta', value: '#DIV/0!', message: 'row 3, column "eta": "#DIV/0!" is not a number' }
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
