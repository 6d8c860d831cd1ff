// Exports in the browser: pick a fit, download its Python module from the
// Export menu beside the pick and run it with python3 at the study's optimum
// (it must give the engine's value there), download a chart as SVG, and the
// study record as PDF. Screenshots at 1440 and 390 px.
import { spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Download, Page } from 'playwright-core';
import { CAUTION } from '../../src/lib/caution';
import { loadFitExport } from '../../src/lib/numerics/export';
import { apiTeamWithDataset, launch, propSweep } from './browser';

let context: BrowserContext;
let close: () => Promise<void>;
const tag = randomBytes(4).toString('hex');
let slug = '';
let studyId = '';
const SHOTS = '.data/screenshots';

const PROP = propSweep(`Export sweep ${tag} (invented)`);

beforeAll(async () => {
	({ context, close } = await launch());
	const team = await apiTeamWithDataset(context, { email: `exports-${tag}@test.example`, password: 'export-password-1', name: 'Export Person', workspace: `Export Team ${tag}` }, PROP);
	slug = team.slug;
	const datasetId = team.datasetId;
	const st = await context.request.post(`/api/v1/workspaces/${slug}/studies`, {
		data: {
			name: `Export study ${tag}`,
			datasetId,
			output: 'eta',
			problem: { kind: 'maximize' },
			fits: [{ method: 'linear' }, { method: 'pchip' }, { method: 'cubic-natural' }],
			optimizers: [{ method: 'sqp' }, { method: 'bfgs' }],
			starts: { latinHypercube: 6, seed: 4 }
		}
	});
	expect(st.status()).toBe(202);
	studyId = (await st.json()).id;
});
afterAll(async () => {
	await close?.();
});

async function shots(page: Page, name: string) {
	mkdirSync(SHOTS, { recursive: true });
	for (const width of [1440, 390]) {
		await page.setViewportSize({ width, height: 900 });
		await page.waitForTimeout(300);
		await page.screenshot({ path: `${SHOTS}/${name}-${width}.png`, fullPage: true });
	}
	await page.setViewportSize({ width: 1280, height: 900 });
}

const saved = async (d: Download) => readFileSync((await d.path())!);

describe('exports in the browser', () => {
	it('picks a fit, runs its Python export at the optimum, downloads an SVG chart and the record PDF', async () => {
		const page = await context.newPage();
		await page.goto(`/w/${slug}/studies/${studyId}`);
		await page.getByRole('heading', { name: 'Scorecard' }).waitFor({ timeout: 90_000 });

		// pick pchip with a rationale
		await page.getByLabel('Fit to pick').selectOption({ label: 'pchip' });
		await page.locator('#pick-rationale').fill('C1, converges from every start, no overshoot');
		await page.getByRole('button', { name: 'Record the pick' }).click();
		await page.getByText('Pick recorded.').waitFor();

		// the Export menu beside the pick: the Python module
		const menu = page.getByTestId('export-menu-pick');
		await menu.locator('summary').click();
		await shots(page, 'export-menu');
		await menu.locator('summary').click();
		await menu.locator('summary').click();
		const [pyDownload] = await Promise.all([page.waitForEvent('download'), menu.locator('a[data-format="python"]').click()]);
		expect(pyDownload.suggestedFilename()).toMatch(/^[A-Za-z0-9_]+_pchip\.py$/);
		const pyPath = join(mkdtempSync(join(tmpdir(), 'kinkless-e2e-')), pyDownload.suggestedFilename());
		await pyDownload.saveAs(pyPath);
		expect(readFileSync(pyPath, 'utf8')).toContain(CAUTION.slice(0, 50));

		// the study's optimum on the picked fit, and the engine's value there (through the fit file)
		const study = await (await context.request.get(`/api/v1/studies/${studyId}`)).json();
		const pchipFit = study.fits.find((f: { method: string }) => f.method === 'pchip');
		expect(study.pick.fitId).toBe(pchipFit.id);
		const best = study.scorecard.filter((r: { fitId: string }) => r.fitId === pchipFit.id).sort((a: { rank: number }, b: { rank: number }) => a.rank - b.rank)[0].best;
		expect(best).not.toBeNull();
		const fitText = await (await context.request.get(`/api/v1/studies/${studyId}/fits/${pchipFit.id}/export?format=json`)).text();
		const { fit } = await loadFitExport(fitText);
		const engine = fit.evaluate(best.x[0]);
		const py = spawnSync(
			'/usr/bin/python3',
			['-c', `import importlib.util, json\ns = importlib.util.spec_from_file_location("m", ${JSON.stringify(pyPath)})\nm = importlib.util.module_from_spec(s); s.loader.exec_module(m)\nf, g, h = m.evaluate(${best.x[0]})\nprint(json.dumps([f, float(g[0])]))`],
			{ encoding: 'utf8' }
		);
		expect(py.status, py.stderr).toBe(0);
		const [f, df] = JSON.parse(py.stdout) as [number, number];
		expect(f).toBe(engine.f);
		expect(df).toBe(engine.df);
		// and the scorecard's f* is the fit's value at x* (common practice, no source: same function, same point)
		expect(Math.abs(f - best.f)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(best.f)));

		// a chart as SVG: it parses, and carries the title
		const chart = page.getByTestId('end-point-charts').getByTestId('chart-download').first();
		const [svgDownload] = await Promise.all([page.waitForEvent('download'), chart.getByRole('button', { name: /as SVG/ }).click()]);
		expect(svgDownload.suggestedFilename()).toMatch(/\.svg$/);
		const svgText = (await saved(svgDownload)).toString('utf8');
		const parsed = await page.evaluate((t) => {
			const doc = new DOMParser().parseFromString(t, 'image/svg+xml');
			return { error: doc.getElementsByTagName('parsererror').length, root: doc.documentElement.nodeName, title: doc.querySelector('title')?.textContent ?? '' };
		}, svgText);
		expect(parsed).toMatchObject({ error: 0, root: 'svg' });
		expect(parsed.title).toContain('End points of the runs');
		const [pngDownload] = await Promise.all([page.waitForEvent('download'), chart.getByRole('button', { name: /as PNG/ }).click()]);
		expect((await saved(pngDownload)).subarray(1, 4).toString('latin1')).toBe('PNG');

		// the study record and its PDF
		await page.getByTestId('record-link').click();
		await page.waitForURL(/\/record$/);
		await expect(page.getByTestId('record-pick').textContent()).resolves.toContain('converges from every start');
		await shots(page, 'study-record');
		const [pdfDownload] = await Promise.all([page.waitForEvent('download'), page.getByTestId('record-pdf').click()]);
		const pdf = await saved(pdfDownload);
		expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
		expect(pdf.length).toBeGreaterThan(5000);
		await page.goto(`/w/${slug}/studies/${studyId}`);
		await page.getByRole('heading', { name: 'Scorecard' }).waitFor();
		await shots(page, 'study-exports');
	});
});
