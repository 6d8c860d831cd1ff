// Every kind of bad upload against the real server and database: a clear
// message naming the row, column or limit, 422 (413 for size limits), and
// nothing stored.
import ExcelJS from 'exceljs';
import { beforeAll, describe, expect, it } from 'vitest';
import { BASE, json } from './client';
import { csv, refused, team, upload, type Created } from './datasetHelpers';

let t: Awaited<ReturnType<typeof team>>;
beforeAll(async () => {
	t = await team('bad');
});

const send = (content: string | Uint8Array, filename = 'table.csv', fields: Record<string, string> = {}) => () => upload(t.owner, t.ws.slug, content, filename, fields);
const MB = 1024 * 1024;

/** Deterministic non-text bytes (a 32-bit LCG), the kind a renamed binary file holds. */
function binaryBytes(n: number): Uint8Array {
	const out = new Uint8Array(n);
	let s = 12345;
	for (let i = 0; i < n; i++) {
		s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
		out[i] = s >>> 24;
	}
	return out;
}

async function workbook(build: (wb: ExcelJS.Workbook) => void): Promise<Uint8Array> {
	const wb = new ExcelJS.Workbook();
	build(wb);
	return new Uint8Array(await wb.xlsx.writeBuffer());
}

describe('unreadable files', () => {
	it('an empty file', async () => {
		const body = await refused(t.ws.id, 422, send(''));
		expect(body.error.code).toBe('empty');
		expect(body.error.message).toBe('the file is empty');
	});

	it('a binary file renamed .csv', async () => {
		const body = await refused(t.ws.id, 422, send(binaryBytes(4096), 'photo.csv'));
		expect(body.error.code).toBe('not-text');
		expect(body.error.message).toMatch(/not a text table/);
	});

	it('a header without data rows', async () => {
		const body = await refused(t.ws.id, 422, send(csv('J [-],eta [-]')));
		expect(body.error.code).toBe('no-rows');
		expect(body.error.message).toContain('has a header (J, eta) but no data rows');
	});

	it('mixed delimiters, naming the rows', async () => {
		const body = await refused(t.ws.id, 422, send(csv('J,eta,ct', '0.1,0.3,0.1', '0.2,0.5,0.09', '0.3;0.6;0.08', '0.4,0.7,0.07')));
		expect(body.error.code).toBe('invalid-dataset');
		expect(body.error.message).toContain('row 4');
		expect(body.error.message).toContain("';'");
		expect(body.error.details).toEqual([{ row: 4, problem: "row 4 uses ';' as the delimiter instead of ','" }]);
	});
});

describe('cells and inputs', () => {
	it('non-numeric and empty cells, each with its row and column', async () => {
		const body = await refused(t.ws.id, 422, send(csv('J [-],eta [-]', '0.1,0.31', '0.2,n/a', '0.3,', '0.4,0.71')));
		expect(body.error.code).toBe('invalid-dataset');
		expect(body.error.details).toEqual(
			expect.arrayContaining([
				expect.objectContaining({ row: 3, column: 'eta', problem: expect.stringContaining('row 3, column "eta"') }),
				expect.objectContaining({ row: 4, column: 'eta', problem: 'row 4, column "eta": the cell is empty' })
			])
		);
		expect(body.error.message).toMatch(/2 problems/);
	});

	it('an input column whose values are all equal', async () => {
		const body = await refused(t.ws.id, 422, send(csv('speed [rpm],eta [-]', '2400,0.31', '2400,0.52', '2400,0.71')));
		expect(body.error.details).toEqual(
			expect.arrayContaining([expect.objectContaining({ column: 'speed', problem: expect.stringContaining('input column "speed" has the same value (2400) in every row; an input must vary') })])
		);
		expect(body.error.message).toContain('input column "speed" has the same value (2400) in every row');
	});

	it('duplicate input points, naming the rows', async () => {
		const body = await refused(t.ws.id, 422, send(csv('J,eta', '0.1,0.3', '0.2,0.5', '0.2,0.52', '0.3,0.6')));
		expect(body.error.message).toContain('rows 3 and 4 have the same inputs (J = 0.2)');
		expect(body.error.details?.[0]).toMatchObject({ row: 4 });
	});

	it('a grid with a missing cell, naming the missing point', async () => {
		const lines = ['torque [N·m],speed [rpm],eff [-]'];
		for (const s of [1000, 2000, 3000]) for (const q of [10, 20, 30]) if (!(s === 2000 && q === 20)) lines.push(`${q},${s},0.9`);
		const body = await refused(t.ws.id, 422, send(csv(...lines), 'map.csv', { roles: JSON.stringify({ torque: 'input', speed: 'input', eff: 'output' }) }));
		expect(body.error.message).toContain('3 × 3 grid');
		expect(body.error.message).toContain('1 of its 9 points is missing: (torque = 20, speed = 2000)');
	});

	it('roles naming a column the table lacks, or not input/output', async () => {
		let body = await refused(t.ws.id, 422, send(csv('J,eta', '0.1,0.3', '0.2,0.5'), 'x.csv', { roles: JSON.stringify({ rpm: 'input' }) }));
		expect(body.error.message).toContain('a role is given for column "rpm", but the table has no such column');
		body = await refused(t.ws.id, 422, send(csv('J,eta', '0.1,0.3', '0.2,0.5'), 'x.csv', { roles: JSON.stringify({ J: 'ignore' }) }));
		expect(body.error.details).toEqual([expect.objectContaining({ field: 'roles.J', problem: 'a column role must be "input" or "output"' })]);
		body = await refused(t.ws.id, 422, send(csv('J,eta', '0.1,0.3', '0.2,0.5'), 'x.csv', { roles: '{J: input' }));
		expect(body.error.details).toEqual([{ field: 'roles', problem: 'not valid JSON' }]);
	});

	it('a multipart form without a file', async () => {
		const form = new FormData();
		form.set('name', 'nothing');
		const body = await refused(t.ws.id, 422, () => t.owner.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, form, { origin: new URL(BASE).origin }));
		expect(body.error.details).toEqual([{ field: 'file', problem: 'missing' }]);
	});
});

describe('limits', () => {
	it('a file over 20 MB with a Content-Length is refused before it is read', async () => {
		const big = new Uint8Array(21 * MB).fill(0x31); // "1111…"
		const body = await refused(t.ws.id, 413, send(big, 'huge.csv'));
		expect(body.error.code).toBe('file-too-large');
		expect(body.error.message).toMatch(/the file limit is 20 MB/);
	});

	it('a streamed upload (no Content-Length) is cut off once it passes 20 MB', async () => {
		const chunk = new TextEncoder().encode('1,2\n'.repeat(16384)); // 64 KiB
		let sent = 0;
		const boundary = 'kinkless-stream-boundary';
		const head = new TextEncoder().encode(`--${boundary}\r\ncontent-disposition: form-data; name="file"; filename="stream.csv"\r\ncontent-type: text/csv\r\n\r\nx,y\n`);
		const stream = new ReadableStream<Uint8Array>({
			start(c) {
				c.enqueue(head);
			},
			pull(c) {
				// 30 MB in all: past the file limit and past the server's BODY_SIZE_LIMIT (25 MB)
				if (sent >= 30 * MB) return c.close();
				sent += chunk.byteLength;
				c.enqueue(chunk);
			}
		});
		const body = await refused(t.ws.id, 413, async () => {
			try {
				return await fetch(`${BASE}/api/v1/workspaces/${t.ws.slug}/datasets`, {
					method: 'POST',
					headers: { cookie: [...t.owner.cookies].map(([k, v]) => `${k}=${v}`).join('; '), origin: new URL(BASE).origin, 'content-type': `multipart/form-data; boundary=${boundary}` },
					body: stream,
					duplex: 'half'
				} as RequestInit);
			} catch (e) {
				throw new Error(`the server dropped the connection instead of answering 413: ${String(e)}`);
			}
		});
		// past the limit the server reads and drops the rest (never holding it), so the client hears the 413
		expect(body.error.message).toBe('the upload is more than 20 MB; the file limit is 20 MB');
	});

	it('more than 1,000,000 rows', async () => {
		const rows = 'x,y\n' + '1,2\n'.repeat(1_000_001);
		const body = await refused(t.ws.id, 413, send(rows, 'long.csv'));
		expect(body.error.code).toBe('too-many-rows');
		expect(body.error.message).toContain('the limit is 1,000,000 rows');
	});

	it('more than 32 columns', async () => {
		const header = Array.from({ length: 33 }, (_, j) => `c${j}`).join(',');
		const row = Array.from({ length: 33 }, (_, j) => String(j)).join(',');
		const body = await refused(t.ws.id, 413, send(csv(header, row, row.replace(/^0/, '1'))));
		expect(body.error.code).toBe('too-many-columns');
		expect(body.error.message).toBe('table has 33 columns; the limit is 32 columns');
	});

	it('a JSON body with more than 32 columns', async () => {
		const columns = Array.from({ length: 33 }, (_, j) => ({ name: `c${j}`, role: j === 0 ? 'input' : 'output' }));
		const body = await refused(t.ws.id, 413, () => t.owner.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, { name: 'wide', columns, rows: [] }));
		expect(body.error.message).toContain('the limit is 32 columns');
	});
});

describe('workbooks', () => {
	const sheetRows = (ws: ExcelJS.Worksheet, rows: (string | number | { formula: string; result?: number })[][]) => rows.forEach((r) => ws.addRow(r));

	it('several sheets: the first with data is used and the answer says which', async () => {
		const bytes = await workbook((wb) => {
			wb.addWorksheet('Notes');
			sheetRows(wb.addWorksheet('Sweep A'), [['J [-]', 'eta [-]'], [0.1, 0.3], [0.2, 0.5], [0.3, 0.62]]);
			sheetRows(wb.addWorksheet('Sweep B'), [['J [-]', 'eta [-]'], [0.1, 0.2], [0.2, 0.4]]);
		});
		const res = await upload(t.owner, t.ws.slug, bytes, 'sweeps.xlsx');
		expect(res.status).toBe(201);
		const created = await json<Created>(res);
		expect(created.rowCount).toBe(3);
		expect(created.warnings).toContain('used sheet "Sweep A", the first sheet with data; the workbook has sheets "Notes", "Sweep A", "Sweep B"');

		const picked = await json<Created>(await upload(t.owner, t.ws.slug, bytes, 'sweeps.xlsx', { sheet: 'Sweep B' }));
		expect(picked.rowCount).toBe(2);
		expect(picked.warnings).toContain('used sheet "Sweep B" as requested; the workbook has sheets "Notes", "Sweep A", "Sweep B"');

		const body = await refused(t.ws.id, 422, send(bytes, 'sweeps.xlsx', { sheet: 'Sweep C' }));
		expect(body.error.message).toBe('the workbook has no sheet "Sweep C"; its sheets are "Notes", "Sweep A", "Sweep B"');
	});

	it('formula cells: their saved values are used, and noted', async () => {
		const bytes = await workbook((wb) => {
			sheetRows(wb.addWorksheet('Polar'), [
				['CL [-]', 'CD [-]'],
				[0.2, { formula: '0.02+0.04*A2^2', result: 0.0216 }],
				[0.4, { formula: '0.02+0.04*A3^2', result: 0.0264 }],
				[0.6, 0.0344]
			]);
		});
		const res = await upload(t.owner, t.ws.slug, bytes, 'polar.xlsx');
		expect(res.status).toBe(201);
		const created = await json<Created>(res);
		expect(created.warnings).toContain('2 cells are formulas; their saved values were used: B2:B3');
		const stored = await t.owner.get(`/api/v1/datasets/${created.id}?rows=1`);
		expect((await json<{ rows: number[][] }>(stored)).rows).toEqual([
			[0.2, 0.0216],
			[0.4, 0.0264],
			[0.6, 0.0344]
		]);
	});

	it('a formula without a saved value is refused, naming the cell', async () => {
		const bytes = await workbook((wb) => {
			sheetRows(wb.addWorksheet('Polar'), [['CL', 'CD'], [0.2, { formula: '0.02+0.04*A2^2' }], [0.4, 0.0264]]);
		});
		const body = await refused(t.ws.id, 422, send(bytes, 'polar.xlsx'));
		expect(body.error.code).toBe('formula-without-value');
		expect(body.error.details?.[0]).toMatchObject({ row: 2, column: 'B' });
	});
});

describe('who may upload', () => {
	it('a viewer gets 403, an outsider 404, a signed-out caller 401', async () => {
		const table = csv('J,eta', '0.1,0.3', '0.2,0.5');
		const viewer = await refused(t.ws.id, 403, () => upload(t.viewer, t.ws.slug, table, 'v.csv'));
		expect(viewer.error.message).toContain('this needs the editor role; you are a viewer');
		const outsider = await refused(t.ws.id, 404, () => upload(t.outsider, t.ws.slug, table, 'o.csv'));
		expect(outsider.error.code).toBe('not-found');
		await refused(t.ws.id, 401, () => fetch(`${BASE}/api/v1/workspaces/${t.ws.slug}/datasets`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{}' }));
	});
});

describe('JSON bodies', () => {
	const post = (body: unknown) => () => t.owner.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, body);

	it('broken JSON is a 400', async () => {
		const res = await t.owner.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, '{"name": ', { 'content-type': 'application/json' });
		expect(res.status).toBe(400);
		expect((await json<{ error: { code: string } }>(res)).error.code).toBe('bad-json');
	});

	it('wrong shapes name the field', async () => {
		let body = await refused(t.ws.id, 422, post({ columns: [{ name: 'x', role: 'input' }], rows: [[1]] }));
		expect(body.error.details).toEqual([{ field: 'name', problem: 'name is required and must be text' }]);

		body = await refused(t.ws.id, 422, post({ name: 'd', columns: [{ name: 'x', role: 'in' }, { name: 'y', role: 'output' }], rows: [[1, 2]] }));
		expect(body.error.details).toEqual([{ field: 'columns[0].role', problem: 'a column role must be "input" or "output"' }]);

		body = await refused(t.ws.id, 422, post({ name: 'd', columns: [{ name: 'x', role: 'input' }, { name: 'y', role: 'output' }], rows: 'none' }));
		expect(body.error.details).toEqual([{ field: 'rows', problem: 'rows must be a list of rows' }]);

		body = await refused(t.ws.id, 422, post([1, 2, 3]));
		expect(body.error.code).toBe('invalid-body');
	});

	it('a row of the wrong length, or a cell that is not a number, names the row and column', async () => {
		const columns = [
			{ name: 'x', unit: 'm', role: 'input' },
			{ name: 'y', role: 'output' }
		];
		let body = await refused(t.ws.id, 422, post({ name: 'd', columns, rows: [[1, 2], [2], [3, 4]] }));
		expect(body.error.details).toEqual([{ row: 2, problem: 'row 2 has 1 value; there are 2 columns' }]);
		body = await refused(t.ws.id, 422, post({ name: 'd', columns, rows: [[1, 2], [2, 'three']] }));
		expect(body.error.details).toEqual([{ row: 2, column: 'y', problem: 'row 2, column "y": each cell must be a finite number' }]);
	});

	it('a JSON table that fails validation (duplicate inputs) is a 422 naming the rows', async () => {
		const body = await refused(
			t.ws.id,
			422,
			post({
				name: 'dups',
				columns: [
					{ name: 'x', role: 'input' },
					{ name: 'y', role: 'output' }
				],
				rows: [
					[1, 2],
					[2, 4],
					[1, 3]
				]
			})
		);
		expect(body.error.message).toBe('rows 1 and 3 have the same inputs (x = 1); each input point may appear only once');
		expect(body.error.details).toEqual([{ row: 3, problem: body.error.message }]);
	});

	it('an unsupported content type is a 400 that says what to send', async () => {
		const res = await t.owner.post(`/api/v1/workspaces/${t.ws.slug}/datasets`, 'x,y\n1,2\n', { 'content-type': 'text/csv', origin: new URL(BASE).origin });
		expect(res.status).toBe(400);
		expect((await json<{ error: { message: string } }>(res)).error.message).toContain('multipart/form-data');
	});
});
