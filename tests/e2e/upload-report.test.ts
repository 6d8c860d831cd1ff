// The upload report in Debian's Chromium: a CSV mixing rows with the wrong
// number of fields, non-numeric and blank cells gets every problem in one
// check, in row order, each bad cell outlined in the preview and each row with
// the wrong number of fields shown as read; screenshots at 1440 and 390 px
// under .data/screenshots/, no sideways scroll at 390 px, AA contrast.
import { mkdirSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext } from 'playwright-core';
import { launch } from './browser';

const AXE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');
const SHOTS = '.data/screenshots';
const tag = randomBytes(4).toString('hex');

// INVENTED propeller sweep with mistakes typed in: file row 4 short, 5 "n/a", 6 blank eta,
// 8 an extra field, 9 blank J, 10 a decimal comma, 11 short
const MIXED = ['J [-],eta [-],CT [-]', '0.1,0.30,0.095', '0.2,0.45', '0.3,n/a,0.080', '0.4,,0.072', '0.5,0.80,0.060', '0.6,0.84,0.050,x', ',0.86,0.043', '0.8,"0,79",0.030', '0.9'].join('\n');

let context: BrowserContext;
let close: () => Promise<void>;
let slug = '';
beforeAll(async () => {
	({ context, close } = await launch());
	const email = `upload-report-${tag}@test.example`;
	const password = 'upload-report-password-1';
	expect((await context.request.post('/api/v1/users', { data: { email, password, name: 'Upload Person' } })).status()).toBe(201);
	expect((await context.request.post('/api/v1/session', { data: { email, password } })).status()).toBe(200);
	slug = (await (await context.request.post('/api/v1/workspaces', { data: { name: `Upload report ${tag}` } })).json()).slug;
});
afterAll(async () => {
	await close?.();
});

describe('the upload report in the browser', () => {
	it('lists every problem in row order and highlights the bad cells and rows in the preview, at 1440 and 390 px', async () => {
		const page = await context.newPage();
		await page.setViewportSize({ width: 1440, height: 900 });
		await page.goto(`/w/${slug}/datasets/new`);
		await page.getByLabel('Choose a file').setInputFiles({ name: 'prop-mistakes.csv', mimeType: 'text/csv', buffer: Buffer.from(MIXED) });
		const status = page.getByTestId('report-status');
		await status.filter({ hasText: '7 problems to fix' }).waitFor();

		const listed = (await page.getByTestId('report-errors').locator('li').allTextContents()).map((t) => t.trim());
		expect(listed).toEqual([
			'row 3 has 2 fields; the table has 3',
			'row 4, column "eta": "n/a" is not a number',
			'row 5, column "eta": the cell is empty',
			'row 7 has 4 fields; the table has 3',
			'row 8, column "J": the cell is empty',
			expect.stringMatching(/^row 9, column "eta": "0,79" /),
			'row 10 has 1 field; the table has 3'
		]);

		// the bad cells, outlined, each titled with its problem; the short and long rows shown as read
		const cells = page.getByTestId('preview-bad-cell');
		expect(await cells.count()).toBe(4);
		expect(await cells.evaluateAll((els) => els.map((e) => [e.closest('tr')!.id, e.getAttribute('title')]))).toEqual([
			['preview-row-4', '"n/a" is not a number'],
			['preview-row-5', 'the cell is empty'],
			['preview-row-8', 'the cell is empty'],
			['preview-row-9', expect.stringMatching(/^"0,79" /)]
		]);
		const outline = await cells.first().evaluate((e) => getComputedStyle(e).boxShadow);
		expect(outline).toMatch(/inset/);
		expect(await page.getByTestId('preview-left-out').allTextContents()).toEqual(['0.2, 0.45', '0.6, 0.84, 0.05, x', '0.9'].map((t) => expect.stringContaining(t)));
		expect(await page.getByTestId('preview-bad-row').evaluateAll((rows) => rows.map((r) => r.id))).toEqual(
			[3, 4, 5, 7, 8, 9, 10].map((r) => `preview-row-${r}`)
		);
		// a listed problem links to its row
		await page.getByRole('link', { name: 'row 8, column "J": the cell is empty' }).click();
		expect(page.url()).toMatch(/#preview-row-8$/);
		await expect(page.getByRole('button', { name: 'Save dataset' }).isDisabled()).resolves.toBe(true);

		mkdirSync(SHOTS, { recursive: true });
		for (const width of [1440, 390]) {
			await page.setViewportSize({ width, height: 900 });
			await page.evaluate(() => window.scrollTo(0, 0));
			await page.screenshot({ path: `${SHOTS}/upload-report-${width}.png`, fullPage: true });
			const sideways = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
			expect(sideways, `the upload page scrolls sideways at ${width} px`).toBeLessThanOrEqual(0);
			// through the debugging protocol: the page's content policy refuses an injected <script>
			await page.evaluate(AXE);
			const violations = await page.evaluate(async () => {
				// eslint-disable-next-line @typescript-eslint/no-explicit-any
				const r = await (window as any).axe.run(document, { runOnly: { type: 'rule', values: ['color-contrast'] } });
				// eslint-disable-next-line @typescript-eslint/no-explicit-any
				return r.violations.flatMap((v: any) => v.nodes.map((n: any) => `${n.target.join(' ')}: ${n.failureSummary}`));
			});
			expect(violations, `text below WCAG AA contrast at ${width} px`).toEqual([]);
		}
		await page.close();
	});
});
