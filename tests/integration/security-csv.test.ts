// Spreadsheet formula injection: column names (the user's text) that a
// spreadsheet would run as formulas are defused in every CSV the app writes
// (OWASP "CSV Injection"). Real server, real PostgreSQL.
import { afterAll, describe, expect, it } from 'vitest';
import { json, testDb } from './client';
import { team, upload, type Created } from './datasetHelpers';

afterAll(async () => {
	await testDb().destroy();
});

describe('CSV downloads defuse formulas', () => {
	it('a fit sampling CSV of columns named =…, +…, @… starts those cells with a quote mark', async () => {
		const t = await team('csvinj');
		const csv = ['=HYPERLINK("http://evil.example") [m],+SUM(A1) [s],@cmd', '1,2,3', '2,3,5', '3,5,4', '4,4,6', '5,6,7'].join('\n') + '\n';
		const r = await upload(t.owner, t.ws.slug, csv, 'inject.csv', { name: 'Injection test', roles: JSON.stringify({ '=HYPERLINK("http://evil.example")': 'input', '+SUM(A1)': 'output', '@cmd': 'output' }) });
		expect(r.status, await r.clone().text()).toBe(201);
		const { id, outputs } = await json<Created>(r);
		expect(outputs).toContain('+SUM(A1)');
		const out = await t.viewer.get(`/api/v1/datasets/${id}/export?output=${encodeURIComponent('+SUM(A1)')}&method=pchip&format=csv`);
		expect(out.status, await out.clone().text()).toBe(200);
		expect(out.headers.get('content-type')).toMatch(/^text\/csv/);
		const text = await out.text();
		const header = text.split('\n').find((l) => l.includes('HYPERLINK'))!;
		expect(header).toBeDefined();
		// every cell of the header that names a column begins with the defusing quote, never with = or +
		for (const cell of header.match(/("([^"]|"")*"|[^,]+)/g)!) {
			const bare = cell.replace(/^"/, '');
			expect(bare, cell).not.toMatch(/^[=+\-@]/);
		}
		expect(header).toContain(`'=HYPERLINK(`);
		expect(header).toContain(`'+SUM(A1)`);
		// numbers stay numbers, negative ones included
		const firstData = text.split('\n').find((l) => /^-?\d/.test(l));
		expect(firstData).toMatch(/^-?\d/);
	});
});
