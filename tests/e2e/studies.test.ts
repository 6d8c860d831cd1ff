// A study in the browser: the new-study form, live progress, scorecard,
// end-point charts, a run's path, the pick, and a share link opened by
// someone who is not signed in.
import { mkdirSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { apiTeamWithDataset, BASE, launch, propSweep } from './browser';

let context: BrowserContext;
let close: () => Promise<void>;
const tag = randomBytes(4).toString('hex');
let slug = '';
let datasetId = '';

const PROP = propSweep(`Prop sweep ${tag} (invented)`);

beforeAll(async () => {
	({ context, close } = await launch());
	// account, workspace and dataset through the API, sharing the browser's cookie jar
	({ slug, datasetId } = await apiTeamWithDataset(context, { email: `studies-${tag}@test.example`, password: 'study-password-1', name: 'Study Person', workspace: `Prop Team ${tag}` }, PROP));
});
afterAll(async () => {
	await close?.();
});

async function screenshot(page: Page, name: string) {
	mkdirSync('.data/screenshots', { recursive: true });
	await page.screenshot({ path: `.data/screenshots/${name}.png`, fullPage: true });
}

describe('studies in the browser', () => {
	it('warns when the bounds reach beyond the data and flags the runs that end outside it (1440 and 390 px)', async () => {
		const r = await context.request.post(`/api/v1/workspaces/${slug}/studies`, {
			data: {
				name: `Beyond the data ${tag}`,
				datasetId,
				output: 'eta',
				problem: { kind: 'minimize', bounds: [[0.1, 3]] },
				fits: [{ method: 'pchip', options: { extrapolation: 'hold' } }],
				optimizers: [{ method: 'bfgs' }, { method: 'nelder-mead' }],
				starts: { points: [[0.5], [1.8], [2.5]] }
			}
		});
		expect(r.status()).toBe(202);
		const { id } = await r.json();
		const page = await context.newPage();
		for (const width of [1440, 390]) {
			await page.setViewportSize({ width, height: 900 });
			await page.goto(`/w/${slug}/studies/${id}`);
			await page.getByRole('heading', { name: 'Scorecard' }).waitFor({ timeout: 90_000 });
			await page.getByTestId('study-status').getByText('done').waitFor({ timeout: 90_000 });
			await page.getByTestId('outside-data').first().waitFor({ timeout: 30_000 });
			await expect(page.getByTestId('launch-warning').textContent()).resolves.toMatch(/reach beyond the data \[0\.1, 1\.5\]/);
			await expect(page.getByTestId('outside-data').first().isVisible()).resolves.toBe(true);
			await expect(page.getByTestId('scorecard').textContent()).resolves.toMatch(/outside the data/);
			await screenshot(page, `study-outside-data-${width}`);
			// the parts this test is about, at readable size
			await page.getByTestId('launch-warning').scrollIntoViewIfNeeded();
			await page.screenshot({ path: `.data/screenshots/study-outside-data-${width}-top.png` });
			await page.getByTestId('outside-data').first().scrollIntoViewIfNeeded();
			await page.screenshot({ path: `.data/screenshots/study-outside-data-${width}-runs.png` });
		}
		await page.close();
	});

	it('launches a study from the form and reads its results', async () => {
		const page = await context.newPage();
		await page.goto(`/w/${slug}`);
		await page.getByRole('link', { name: 'New study' }).click();
		await page.getByRole('heading', { name: 'New study' }).waitFor();
		await page.getByLabel('Study name').fill(`Peak efficiency ${tag}`);
		await page.getByLabel('Number of starts').fill('12');
		await page.getByRole('button', { name: 'Launch study' }).click();
		await page.waitForURL(/\/studies\/[0-9a-f-]{36}$/);

		await page.getByRole('heading', { name: 'Scorecard' }).waitFor({ timeout: 90_000 });
		await expect(page.getByTestId('study-status').textContent()).resolves.toBe('done');
		await expect(page.getByTestId('caution').textContent()).resolves.toContain('decision aids computed from your data');
		await expect(page.getByTestId('rank-rule').textContent()).resolves.toContain('success rate');
		// 5 default fits × 2 default optimizers
		await expect(page.getByTestId('scorecard').locator('tbody tr').count()).resolves.toBe(10);
		// one chart per fit, drawn in the browser
		await page.getByTestId('end-point-charts').locator('svg').first().waitFor();
		expect(await page.getByTestId('end-point-charts').locator('figure svg').count()).toBeGreaterThanOrEqual(5);

		// the linear fit's runs: filtered from the scorecard, stalled at a kink, path on demand
		await page.getByTestId('scorecard').getByRole('button', { name: 'linear', exact: true }).first().click();
		await expect(page.getByTestId('runs-count').textContent()).resolves.toBe('12 runs');
		await expect(page.getByTestId('runs').getByText('at a kink').first().isVisible()).resolves.toBe(true);
		await page.getByTestId('runs').getByRole('button', { name: 'Path' }).first().click();
		await page.getByTestId('path').waitFor();
		expect(await page.getByTestId('path').locator('tbody tr').count()).toBeGreaterThanOrEqual(2);
		await screenshot(page, 'study');

		// the pick
		await page.getByLabel('Fit to pick').selectOption({ label: 'pchip' });
		await page.getByLabel('Rationale').fill('Converges from every start with both optimizers; C1; keeps the data shape.');
		await page.getByRole('button', { name: 'Record the pick' }).click();
		await page.getByRole('heading', { name: 'Picked: pchip' }).waitFor();
		await page.close();
	});

	it('shows a progress bar while a bigger study runs, then the results', async () => {
		const r = await context.request.post(`/api/v1/workspaces/${slug}/studies`, {
			data: {
				name: `Long study ${tag}`,
				datasetId,
				output: 'eta',
				problem: { kind: 'maximize' },
				fits: [{ method: 'linear' }, { method: 'pchip' }, { method: 'akima' }, { method: 'cubic-natural' }],
				optimizers: [{ method: 'sqp' }, { method: 'nelder-mead' }],
				starts: { latinHypercube: 1000, seed: 4 }
			}
		});
		expect(r.status()).toBe(202);
		const { id } = await r.json();
		const page = await context.newPage();
		await page.goto(`/w/${slug}/studies/${id}`);
		const bar = page.getByRole('progressbar', { name: 'Runs stored' });
		if (await bar.isVisible()) {
			await expect(page.getByTestId('progress-counts').textContent()).resolves.toMatch(/of 8,000 runs/);
			await page.waitForTimeout(600); // the bar eases to its new width
			await screenshot(page, 'study-running');
		}
		await page.getByRole('heading', { name: 'Scorecard' }).waitFor({ timeout: 150_000 });
		// the last progress event may land just after the scorecard is drawn: the bar must then go
		await bar.waitFor({ state: 'detached', timeout: 15_000 });
		await expect(bar.count()).resolves.toBe(0);
		await page.close();
	});

	it('shares a read-only link that works without signing in, until it is revoked', async () => {
		const page = await context.newPage();
		await page.goto(`/w/${slug}`);
		await page.getByRole('link', { name: `Peak efficiency ${tag}` }).click();
		await page.getByRole('button', { name: 'Make a link' }).click();
		const url = await page.getByTestId('share-url').getAttribute('href');
		expect(url).toMatch(new RegExp(`^${BASE}/shared/[A-Za-z0-9_-]{40,}$`));

		const { context: stranger, close: closeStranger } = await launch();
		try {
			const other = await stranger.newPage();
			await other.goto(url!);
			await other.getByRole('heading', { name: `Peak efficiency ${tag}` }).waitFor();
			await other.getByRole('heading', { name: 'Scorecard' }).waitFor();
			await expect(other.getByTestId('caution').isVisible()).resolves.toBe(true);
			await expect(other.getByRole('button', { name: 'Record the pick' }).count()).resolves.toBe(0);
			await screenshot(other, 'study-shared');

			await page.getByRole('button', { name: 'Revoke the link' }).click();
			await page.getByRole('status').filter({ hasText: 'Link revoked.' }).waitFor();
			const again = await other.goto(url!);
			expect(again?.status()).toBe(404);
		} finally {
			await closeStranger();
		}
		await page.close();
	});
});
