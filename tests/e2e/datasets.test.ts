// Upload, check, fix a role, save and preview fits, in Debian's Chromium against the built app.
import { randomBytes } from 'node:crypto';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { launch } from './browser';
import { json, newUser, newWorkspace } from '../integration/client';

let context: BrowserContext;
let close: () => Promise<void>;
beforeAll(async () => {
	({ context, close } = await launch());
});
afterAll(async () => {
	await close?.();
});

const tag = randomBytes(4).toString('hex');
const SCREENSHOT = process.env.KINKLESS_SCREENSHOT ?? '/tmp/kinkless-dataset-page.png';

// Efficiency first, advance ratio second: with the default roles (first column
// input) efficiency would be the input, and its values repeat.
const CSV = [
	'efficiency eta [-],advance ratio J [-],thrust coefficient (-)',
	'0.18,0.1,0.110',
	'0.35,0.2,0.104',
	'0.50,0.3,0.097',
	'0.62,0.4,0.088',
	'0.72,0.5,0.078',
	'0.79,0.6,0.066',
	'0.82,0.7,0.052',
	'0.79,0.8,0.037',
	'0.69,0.9,0.021',
	'0.45,1.0,0.008'
].join('\n');

async function signIn(page: Page, email: string, password: string) {
	await context.clearCookies();
	await page.goto('/login');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await page.getByRole('heading', { name: 'Your workspaces' }).waitFor();
}

describe('datasets in the browser', () => {
	it('uploads a CSV with units, reads the report, fixes a role, saves, and previews linear and Akima fits with the kinks shown', async () => {
		const user = await newUser(`e2e-ds-${tag}`);
		const ws = await newWorkspace(user.client, `Prop Lab ${tag}`);
		const page = await context.newPage();
		await signIn(page, user.email, user.password);

		await page.goto(`/w/${ws.slug}`);
		await page.getByRole('link', { name: 'Upload a dataset' }).click();
		await page.getByRole('heading', { name: 'Upload a dataset' }).waitFor();

		// choosing the file checks it at once
		await page.getByLabel('Choose a file').setInputFiles({ name: 'prop-sweep.csv', mimeType: 'text/csv', buffer: Buffer.from(CSV) });
		const status = page.getByTestId('report-status');
		await status.filter({ hasText: 'problem' }).waitFor();
		await expect(page.getByTestId('report-errors').textContent()).resolves.toContain('have the same inputs (efficiency eta = 0.79)');
		await expect(page.getByTestId('checked-source').textContent()).resolves.toContain('prop-sweep.csv');
		// units read from "name [unit]" and "name (unit)"
		const header = page.getByRole('columnheader', { name: /advance ratio J/ });
		await expect(header.textContent()).resolves.toContain('[-]');
		await expect(page.getByTestId('shape').textContent()).resolves.toContain('curve');

		// fix the roles: J is the input, efficiency an output
		await page.getByLabel('Role of advance ratio J').selectOption('input');
		await status.filter({ hasText: '2 inputs' }).waitFor();
		await page.getByLabel('Role of efficiency eta').selectOption('output');
		await status.filter({ hasText: 'Ready to save: 10 rows, 1 input (advance ratio J), 2 outputs (efficiency eta, thrust coefficient)' }).waitFor();
		await page.screenshot({ path: '/tmp/kinkless-upload-report.png', fullPage: true });
		await expect(page.getByTestId('shape').textContent()).resolves.toContain('one input column ("advance ratio J"), so the data are a curve');

		await page.getByLabel('Name').fill(`Prop sweep ${tag}`);
		await page.getByRole('button', { name: 'Save dataset' }).click();
		await page.getByRole('heading', { level: 1, name: `Prop sweep ${tag}` }).waitFor();
		expect(page.url()).toMatch(new RegExp(`/w/${ws.slug}/datasets/[0-9a-f-]{36}$`));
		await expect(page.getByTestId('row-count').textContent()).resolves.toBe('10');

		// the preview starts with the linear fit: C0, with its slope jumps listed and marked
		await page.getByLabel('Output').selectOption('efficiency eta');
		const measured = page.getByTestId('measured');
		await measured.filter({ hasText: /^C0$/ }).waitFor();
		const jumps = page.getByTestId('worst-jumps').locator('tbody tr');
		await expect(jumps.count()).resolves.toBe(5);
		await expect(jumps.first().locator('td').first().textContent()).resolves.toBe('0.9');
		await page.getByText(/Orange.*8 marked/).waitFor();
		await expect(page.getByTestId('caution').textContent()).resolves.toContain('decision aids computed from your data');
		await page.getByTestId('preview-df').scrollIntoViewIfNeeded();
		await page.screenshot({ path: '/tmp/kinkless-dataset-linear.png', fullPage: true });

		// Akima: C1, no slope jumps
		await page.getByLabel('Method').selectOption('akima');
		await measured.filter({ hasText: /^C1$/ }).waitFor();
		await expect(page.getByText(/Orange.*marked/).count()).resolves.toBe(0);
		await expect(page.getByTestId('smoothness').textContent()).resolves.toMatch(/declared\s*C1/);

		// the table sorts by a column
		await page.getByTestId('data-table').getByRole('button', { name: /efficiency eta/ }).click();
		await page.getByTestId('data-table').getByRole('button', { name: /efficiency eta/ }).click();
		const firstRow = page.getByTestId('data-table').locator('tbody tr').first();
		await expect(firstRow.locator('td').nth(1).textContent()).resolves.toBe('0.82');

		await page.screenshot({ path: SCREENSHOT, fullPage: true });
		console.log(`dataset page screenshot: ${SCREENSHOT}`);

		// the workspace page lists it
		await page.goto(`/w/${ws.slug}`);
		const listed = page.getByTestId('datasets').getByRole('row').filter({ hasText: `Prop sweep ${tag}` });
		await expect(listed.textContent()).resolves.toMatch(/v1\s*curve\s*10/);
		await page.close();
	});

	it('a 100,000-row table renders only the rows in view and still sorts', async () => {
		const user = await newUser(`e2e-big-${tag}`);
		const ws = await newWorkspace(user.client, `Big Table ${tag}`);
		const n = 100_000;
		const rows = Array.from({ length: n }, (_, i) => [i / 1000, Math.sin(i / 5000)]);
		const res = await user.client.post(`/api/v1/workspaces/${ws.slug}/datasets`, {
			name: 'Long sweep',
			columns: [
				{ name: 'x', unit: 's', role: 'input' },
				{ name: 'y', unit: 'V', role: 'output' }
			],
			rows
		});
		expect(res.status).toBe(201);
		const { id } = await json<{ id: string }>(res);

		const page = await context.newPage();
		await signIn(page, user.email, user.password);
		await page.goto(`/w/${ws.slug}/datasets/${id}`);
		const table = page.getByTestId('data-table');
		await table.locator('tbody tr').nth(3).waitFor();
		const rendered = await table.locator('tbody tr').count();
		expect(rendered).toBeLessThan(60);
		expect(await table.locator('table').getAttribute('aria-rowcount')).toBe(String(n + 1));

		await table.evaluate((el) => (el.scrollTop = 28 * 50_000));
		await table.locator('tbody tr[aria-rowindex="50002"]').waitFor();
		expect(await table.locator('tbody tr').count()).toBeLessThan(60);

		await page.getByRole('button', { name: /^y/ }).click();
		await page.getByRole('button', { name: /^y/ }).click(); // descending
		await table.evaluate((el) => (el.scrollTop = 0));
		const top = table.locator('tbody tr[aria-rowindex="2"] td');
		await expect(top.nth(2).textContent()).resolves.toBe(String(Math.max(...rows.map((r) => r[1]))));
		await page.close();
	});

	it('the demo motor map is drawn as a colour map over torque × speed', async () => {
		const page = await context.newPage();
		await signIn(page, 'demo@larkmoor.example', 'larkmoor-demo-2026');
		await page.goto('/w/larkmoor-aero');
		await page.getByRole('link', { name: 'Motor efficiency map' }).click();
		await page.getByRole('heading', { level: 1, name: 'Motor efficiency map' }).waitFor();
		await expect(page.getByTestId('dataset-shape').textContent()).resolves.toBe('grid');
		// the raster mark draws an image inside the plot's svg
		await page.getByTestId('data-plot').locator('svg image').first().waitFor();
		// the fit preview of a grid: a map and slices (tests/e2e/surfaces.test.ts looks closer)
		await page.getByTestId('preview-map').locator('svg image').first().waitFor();
		await page.screenshot({ path: '/tmp/kinkless-grid-page.png', fullPage: true });
		await page.close();
	});

	it('a TSV file dropped on the page is checked at once; an XLSX with several sheets offers the others', async () => {
		const user = await newUser(`e2e-drop-${tag}`);
		const ws = await newWorkspace(user.client, `Drop ${tag}`);
		const page = await context.newPage();
		await signIn(page, user.email, user.password);
		await page.goto(`/w/${ws.slug}/datasets/new`);
		const tsv = 'flow [m³/s]\tpressure rise [Pa]\n0\t410\n0.1\t385\n0.2\t330\n0.3\t250\n';
		const dropped = await page.evaluateHandle((text) => {
			const d = new DataTransfer();
			d.items.add(new File([text], 'fan.tsv', { type: 'text/tab-separated-values' }));
			return d;
		}, tsv);
		await page.getByRole('group', { name: 'Drop a file here' }).dispatchEvent('drop', { dataTransfer: dropped });
		await page.getByTestId('report-status').filter({ hasText: 'Ready to save: 4 rows, 1 input (flow), 1 output (pressure rise)' }).waitFor();
		await expect(page.getByTestId('checked-source').textContent()).resolves.toContain('fan.tsv');
		await page.getByRole('button', { name: 'Save dataset' }).click();
		await page.getByRole('heading', { level: 1, name: 'fan' }).waitFor();

		const wb = new ExcelJS.Workbook();
		const a = wb.addWorksheet('Sweep A');
		[['J [-]', 'eta [-]'], [0.1, 0.3], [0.2, 0.5], [0.3, 0.62]].forEach((r) => a.addRow(r));
		const b = wb.addWorksheet('Sweep B');
		[['J [-]', 'eta [-]'], [0.1, 0.2], [0.2, 0.4]].forEach((r) => b.addRow(r));
		const xlsx = Buffer.from(await wb.xlsx.writeBuffer());
		await page.goto(`/w/${ws.slug}/datasets/new`);
		await page.getByLabel('Choose a file').setInputFiles({ name: 'sweeps.xlsx', mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', buffer: xlsx });
		await page.getByTestId('report-status').filter({ hasText: 'Ready to save: 3 rows' }).waitFor();
		await expect(page.getByTestId('report-notes').textContent()).resolves.toContain('used sheet "Sweep A", the first sheet with data');
		await page.getByLabel('Sheet').selectOption('Sweep B');
		await page.getByTestId('report-status').filter({ hasText: 'Ready to save: 2 rows' }).waitFor();
		await expect(page.getByTestId('checked-source').textContent()).resolves.toContain('sheet "Sweep B"');
		await page.close();
	});
});
