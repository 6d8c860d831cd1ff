// The invented demo motor map (torque × speed) in Debian's Chromium: its
// seeded study — the problem over both inputs, the scorecard with the
// bilinear fit last, the end points drawn in the inputs' plane, the runs with
// both coordinates — and the dataset page's fit preview of the grid (map,
// slices, audit per input, fidelity). Screenshots at 1440 and 390 px under
// .data/screenshots/ (no sideways scroll at 390).
import { mkdirSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { tellingStart } from '../../src/lib/replay/lockstep';
import { apiTeamWithDataset, expectContrast, launch } from './browser';

const SHOTS = '.data/screenshots';
let context: BrowserContext;
let close: () => Promise<void>;

beforeAll(async () => {
	({ context, close } = await launch());
	expect((await context.request.post('/api/v1/session', { data: { email: 'demo@larkmoor.example', password: 'larkmoor-demo-2026' } })).status()).toBe(200);
});
afterAll(async () => {
	await close?.();
});

async function shots(page: Page, name: string) {
	mkdirSync(SHOTS, { recursive: true });
	for (const width of [1440, 390]) {
		await page.setViewportSize({ width, height: 900 });
		await page.waitForLoadState('networkidle');
		await page.screenshot({ path: `${SHOTS}/${name}-${width}.png`, fullPage: true });
		if (width === 390) {
			const wide = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
			expect(wide, 'sideways scroll at 390 px').toBeLessThanOrEqual(1);
		}
	}
}

const studyIdOf = (url: string) => url.split('/').at(-1)!;
const frameText = (page: Page) => page.getByTestId('paths-controls').getByTestId('replay-frame').textContent();
/** the segments of a map's trail so far (the moving layer's path: one L per step taken) */
const trailSteps = async (page: Page, fit: string) => ((await page.locator(`[data-testid="paths-map"][data-fit="${fit}"] .replay-moving path[fill="none"]`).first().getAttribute('d')) ?? '').split('L').length - 1;

type ApiRun = { method: string; optimizerIndex: number; startIndex: number; outcome: string; atKink: boolean; iterations: number; fitId: string; id: string; start: number[]; x: number[]; f: number | null };

/**
 * The paths view opens as the curve replay does (the same ReplaySession): the
 * first optimizer, the start the fits disagree most from (tellingStart), the
 * clock at iteration 0 with every path at its start; → and the Step button move
 * every fit on by one, Space plays and pauses, End shows where each ended, Home
 * goes back, and a new start goes back to iteration 0. Every fit follows the
 * one clock: each shows min(clock, its own last iteration).
 */
async function expectPathsOpenLikeTheCurveReplay(page: Page, studyId: string, c: BrowserContext, where: 'map' | 'coordinate' = 'map') {
	const { runs } = (await (await c.request.get(`/api/v1/studies/${studyId}/runs`)).json()) as { runs: ApiRun[] };
	const opening = tellingStart(runs, 0);
	expect(opening).not.toBeNull();
	await expect(page.getByTestId('paths-optimizer').inputValue()).resolves.toBe('0');
	await expect(page.getByTestId('paths-start').inputValue()).resolves.toBe(String(opening));
	const shown = runs.filter((r) => r.optimizerIndex === 0 && r.startIndex === opening);
	expect(shown.length).toBeGreaterThanOrEqual(2);
	const last = Math.max(...shown.map((r) => r.iterations));
	expect(last, 'the paths have steps to replay').toBeGreaterThan(3);
	const item = (fit: string) => page.locator(`[data-testid="${where === 'map' ? 'paths-map' : 'paths-fit'}"][data-fit="${fit}"]`);
	/** every fit at min(k, its last iteration), said as ended only at its end */
	const expectAllAt = async (k: number) => {
		await expect(frameText(page)).resolves.toBe(`iteration ${k} / ${last}`);
		for (const r of shown) {
			const at = Math.min(k, r.iterations);
			await expect(item(r.method).getByTestId('panel-iteration').textContent(), r.method).resolves.toBe(`iteration ${at} of ${r.iterations}`);
			await expect(item(r.method).getAttribute('data-ended'), r.method).resolves.toBe(String(at === r.iterations));
			await expect(item(r.method).getByTestId('panel-outcome').textContent(), r.method).resolves.toMatch(new RegExp(`^\\s*${at === r.iterations ? 'ended' : 'ends'}\\s+${r.outcome}${r.atKink ? ' at a kink' : ''}\\s*$`));
			if (where === 'map') await expect.poll(() => trailSteps(page, r.method), { message: `${r.method}'s trail at ${k}` }).toBe(at);
		}
	};
	// at open: the first iteration, every path at its start
	await expectAllAt(0);
	// → with focus anywhere in the view, then the Step button: one iteration each time, on every fit
	await page.getByTestId('paths-controls').getByRole('button', { name: /^Step forward/ }).focus();
	await page.keyboard.press('ArrowRight');
	await expectAllAt(1);
	await expect(page.getByTestId('paths-announce').textContent()).resolves.toMatch(/^Iteration 1: /);
	await page.getByTestId('paths-controls').getByRole('button', { name: /^Step forward/ }).click();
	await expectAllAt(2);
	// Space plays (the clock moves on by itself), Space pauses; the fits are still in lockstep (at ½ speed, so it is paused before the end)
	await page.keyboard.press('[');
	await expect(page.getByTestId('paths-controls').getByTestId('replay-speed').textContent()).resolves.toBe('0.5×');
	await page.keyboard.press(' ');
	await page.getByTestId('paths-controls').getByTestId('replay-frame').filter({ hasNotText: /^iteration 2 \// }).waitFor();
	await page.keyboard.press(' ');
	await expect(page.getByTestId('paths-controls').getByRole('button', { name: 'Play (Space)' }).count()).resolves.toBe(1);
	const [, paused] = (await frameText(page))!.match(/^iteration (\d+) \//)!;
	expect(Number(paused)).toBeGreaterThan(2);
	await expectAllAt(Number(paused));
	await page.keyboard.press(']');
	// End: where each run ended; Home: back to the start
	await page.keyboard.press('End');
	await expectAllAt(last);
	await page.keyboard.press('Home');
	await expectAllAt(0);
	// another start, from the end: the clock goes back to the first iteration, as the curve replay's does
	await page.keyboard.press('End');
	const other = [...new Set(runs.map((r) => r.startIndex))].find((s) => s !== opening)!;
	await page.getByTestId('paths-start').selectOption(String(other));
	await expect(frameText(page)).resolves.toMatch(/^iteration 0 \//);
}

/** the paths view alone at 1440 and 390 px, tall enough to show it whole */
async function pathShots(page: Page, name: string) {
	mkdirSync(SHOTS, { recursive: true });
	const view = page.getByTestId('paths');
	for (const width of [1440, 390]) {
		await page.setViewportSize({ width, height: 900 });
		await page.waitForTimeout(300); // the charts redraw at the new width
		const box = await view.boundingBox();
		await page.setViewportSize({ width, height: Math.ceil((box?.height ?? 900) + 200) });
		await view.scrollIntoViewIfNeeded();
		await view.screenshot({ path: `${SHOTS}/${name}-${width}.png` });
		const wide = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
		expect(wide, `${name} scrolls sideways at ${width} px`).toBeLessThanOrEqual(1);
	}
	await page.setViewportSize({ width: 1280, height: 900 });
}

describe('the demo study over torque × speed', () => {
	it('is finished: the bilinear fit stalls on grid lines, every run on the smooth fits converges (runs API)', async () => {
		const list = (await (await context.request.get('/api/v1/workspaces/larkmoor-aero/studies')).json()) as { studies: { id: string; name: string; status: string }[] };
		const study = list.studies.find((s) => s.name === 'Motor: peak efficiency over torque × speed');
		expect(study?.status).toBe('done');
		const { runs } = (await (await context.request.get(`/api/v1/studies/${study!.id}/runs`)).json()) as { runs: { method: string; outcome: string; atKink: boolean; x: number[] }[] };
		expect(runs).toHaveLength(5 * 2 * 20);
		const torqueNodes = [5, 10, 20, 30, 40, 55, 70, 85];
		const speedNodes = [500, 1000, 1500, 2000, 2500, 3000, 3500, 4000];
		for (const r of runs) {
			if (r.method === 'grid-linear') {
				expect(r.outcome === 'stalled' && r.atKink, `${r.outcome} at (${r.x})`).toBe(true);
				// at a kink: on a grid line of torque or of speed (the data's own values)
				expect(torqueNodes.some((v) => Math.abs(v - r.x[0]) < 1e-4) || speedNodes.some((v) => Math.abs(v - r.x[1]) < 1e-2)).toBe(true);
			} else expect(r.outcome, r.method).toBe('converged');
		}
	});

	it('shows the problem over both inputs, the scorecard, the end points in the plane and the runs', async () => {
		const page = await context.newPage();
		await page.goto('/w/larkmoor-aero');
		await page.getByRole('link', { name: 'Motor: peak efficiency over torque × speed' }).click();
		await page.getByRole('heading', { name: /^Picked: grid-/ }).waitFor();
		await expect(page.getByTestId('problem').textContent()).resolves.toMatch(/^Maximize efficiency \[-\] for torque in \[5, 85\], speed in \[3500, 4000\]\.$/);
		// the bilinear fit ranks last: its runs stall on grid lines
		const rows = page.locator('table').first().locator('tbody tr');
		await expect(rows.count()).resolves.toBe(10);
		await expect(rows.last().textContent()).resolves.toMatch(/grid-linear/);
		await expect(rows.last().locator('[data-testid="other-outcomes"]').textContent()).resolves.toMatch(/at a kink/);
		for (const row of await rows.filter({ hasText: 'grid-cubic-not-a-knot' }).all()) await expect(row.textContent()).resolves.toMatch(/100%/);
		// one chart per fit, drawn over torque and speed
		const charts = page.getByTestId('end-point-charts').locator('figure');
		await expect(charts.count()).resolves.toBe(5);
		await expect(charts.first().locator('svg').first().textContent()).resolves.toMatch(/speed \[rpm\]/);
		// runs list both coordinates under named headings
		const runs = page.getByTestId('runs');
		await expect(runs.locator('thead').textContent()).resolves.toContain('(torque, speed)');
		await expect(runs.locator('tbody tr').first().locator('td').nth(6).textContent()).resolves.toMatch(/^[-\d.e]+, [-\d.e]+$/);
		// the paths of one start on every fit's map, the C0 grid lines marked on the bilinear one
		const maps = page.getByTestId('paths-map');
		await expect(maps.count()).resolves.toBe(5);
		await page.locator('[data-testid="paths-map"][data-ended]').first().waitFor();
		await expect(maps.first().textContent()).resolves.toMatch(/grid-linear \(C0\)\s*iteration 0 of \d+\s*ends\s+stalled at a kink/);
		await expect(maps.first().locator(`[stroke="#c2410c"] line, line[stroke="#c2410c"]`).count()).resolves.toBeGreaterThanOrEqual(6);
		// one colour scale for all the maps, with its legend
		await expect(page.getByTestId('paths-legend').textContent()).resolves.toContain('efficiency');
		await expectPathsOpenLikeTheCurveReplay(page, studyIdOf(page.url()), context);
		await page.getByTestId('paths-start').selectOption('3');
		await expect(page.locator('[data-testid="paths-map"][data-fit="grid-cubic-not-a-knot"]').textContent()).resolves.toMatch(/grid-cubic-not-a-knot \(C2\)\s*iteration 0 of \d+\s*ends\s+converged/);
		await expectContrast(page, '[data-testid="paths"]', 'the paths on the maps');
		await pathShots(page, 'demo-motor-paths');
		await shots(page, 'demo-motor-study');
		await page.close();
	});
});

describe('the fit preview of the demo motor map', () => {
	it('maps the fit, slices it through a chosen point, audits each input and shows the leave-one-out fidelity', async () => {
		const page = await context.newPage();
		await page.goto('/w/larkmoor-aero');
		await page.getByRole('link', { name: 'Motor efficiency map' }).click();
		await page.getByRole('heading', { level: 1, name: 'Motor efficiency map' }).waitFor();
		// the default: not-a-knot, C2 along both inputs
		await page.getByTestId('preview-map').locator('svg image').first().waitFor();
		await expect(page.getByTestId('measured').textContent()).resolves.toBe('C2');
		await expect(page.getByTestId('audit-per-input').locator('tbody tr').count()).resolves.toBe(2);
		await expect(page.getByTestId('preview-slices').locator('figure').count()).resolves.toBe(4);
		await expect(page.getByTestId('loo-rmse').textContent()).resolves.toMatch(/^\d/);
		// the bilinear fit: C0, every interior grid line a kink, drawn on the map
		await page.getByLabel('Method').selectOption('grid-linear');
		await page.getByText('Showing grid-linear').waitFor();
		await expect(page.getByTestId('measured').textContent()).resolves.toBe('C0');
		await expect(page.getByTestId('audit-per-input').locator('tbody tr').first().locator('td').nth(2).textContent()).resolves.toBe('6');
		// slices through a chosen point
		await page.getByTestId('through-1').fill('3750');
		await page.getByText(/Slices through torque = 45, speed = 3750/).waitFor();
		await shots(page, 'demo-motor-preview');
		await page.close();
	});
});

describe('a study over three inputs', () => {
	it('shows the end points input by input and each input against iteration, one line per fit', async () => {
		const { context: c, close: closeC } = await launch();
		try {
			const tag = Math.random().toString(16).slice(2, 10);
			const axes = [[0, 1, 2, 3], [0, 0.5, 1], [-1, -0.3, 0.4, 1]];
			const rows: number[][] = [];
			for (const a of axes[0]) for (const b of axes[1]) for (const d of axes[2]) rows.push([a, b, d, (a - 1.2) ** 2 + (b - 0.4) ** 2 + (d - 0.1) ** 2]);
			const ds = { name: 'Bowl over three inputs (invented)', columns: [{ name: 'a', role: 'input' }, { name: 'b', role: 'input' }, { name: 'd', role: 'input' }, { name: 'g', role: 'output' }], rows };
			const { slug, datasetId } = await apiTeamWithDataset(c, { email: `surf3-${tag}@test.example`, password: 'surface-password-1', name: 'Surface Person', workspace: `Surfaces ${tag}` }, ds);
			const st = await c.request.post(`/api/v1/workspaces/${slug}/studies`, {
				data: { name: 'Bowl: min g', datasetId, output: 'g', problem: { kind: 'minimize' }, fits: [{ method: 'grid-linear' }, { method: 'grid-cubic-not-a-knot' }], optimizers: [{ method: 'bfgs' }], starts: { latinHypercube: 3, seed: 4 } }
			});
			expect(st.status()).toBe(202);
			const id = (await st.json()).id;
			for (let i = 0; i < 200 && (await (await c.request.get(`/api/v1/studies/${id}`)).json()).status !== 'done'; i++) await new Promise((r) => setTimeout(r, 300));
			const page = await c.newPage();
			await page.goto(`/w/${slug}/studies/${id}`);
			await expect(page.getByTestId('problem').textContent()).resolves.toMatch(/^Minimize g for a in \[0, 3\], b in \[0, 1\], d in \[-1, 1\] \(the data’s range\)\.$/);
			await expect(page.getByTestId('end-point-charts').locator('figure').count()).resolves.toBe(2);
			const coords = page.getByTestId('paths-by-coordinate').locator('figure');
			await expect(coords.count()).resolves.toBe(3);
			await coords.first().locator('.replay-moving path').first().waitFor({ state: 'attached' });
			// slices of both fits along each input through the current iterate, evaluated in the browser from the fit files
			const slices = page.getByTestId('paths-slices').locator('figure');
			await expect(slices.count()).resolves.toBe(3);
			await slices.first().locator('svg [aria-label="line"] path').first().waitFor({ state: 'attached' });
			await expect(slices.first().locator('svg [aria-label="line"] path').count()).resolves.toBe(2);
			// the same clock and opening as the curve replay; the slices follow it
			await expect(page.getByTestId('paths-slices').getAttribute('data-frame')).resolves.toBe('0');
			const sliceAt0 = await slices.first().innerHTML();
			await expectPathsOpenLikeTheCurveReplay(page, id, c, 'coordinate');
			// (now on another start, at its first iteration) one step on, the slices are drawn through the next iterate
			await page.getByTestId('paths-controls').getByRole('button', { name: /^Step forward/ }).click();
			await expect(page.getByTestId('paths-slices').getAttribute('data-frame')).resolves.toBe('1');
			const sliceAt1 = await slices.first().innerHTML();
			await page.keyboard.press('End');
			await expect.poll(() => slices.first().innerHTML()).not.toBe(sliceAt1);
			await page.keyboard.press('Home');
			await expect(page.getByTestId('paths-slices').getAttribute('data-frame')).resolves.toBe('0');
			await expect.poll(() => slices.first().innerHTML()).not.toBe(sliceAt1);
			expect(sliceAt0).toContain('<path');
			await expectContrast(page, '[data-testid="paths"]', 'the paths input by input');
			await pathShots(page, 'study-three-inputs-paths');
			await shots(page, 'study-three-inputs');
			await page.close();
		} finally {
			await closeC();
		}
	});
});

describe('uploading a grid with a missing cell', () => {
	it('names the cell, and the table can be taken as scattered points instead', async () => {
		const { context: c, close: closeC } = await launch();
		try {
			const tag = Math.random().toString(16).slice(2, 10);
			const { slug } = await apiTeamWithDataset(c, { email: `holed-${tag}@test.example`, password: 'surface-password-1', name: 'Surface Person', workspace: `Holes ${tag}` }, { name: 'seed row (invented)', columns: [{ name: 'x', role: 'input' }, { name: 'y', role: 'output' }], rows: [[0, 0], [1, 1]] });
			const lines = ['T [N·m],w [krpm],eta [-]'];
			for (const T of [0, 2, 4, 6]) for (const w of [1, 2, 3]) if (!(T === 4 && w === 2)) lines.push(`${T},${w},${(0.9 - 0.01 * (T - 3) ** 2 - 0.02 * (w - 2) ** 2).toFixed(4)}`);
			const page = await c.newPage();
			await page.goto(`/w/${slug}/datasets/new`);
			await page.getByLabel('Choose a file').setInputFiles({ name: 'holed-map.csv', mimeType: 'text/csv', buffer: Buffer.from(lines.join('\n') + '\n') });
			const status = page.getByTestId('report-status');
			await status.filter({ hasText: /./ }).waitFor();
			// T is the input by default (the first column); w is one too
			await page.getByLabel('Role of w').selectOption('input');
			await page.getByTestId('report-errors').filter({ hasText: '(T = 4, w = 2)' }).waitFor();
			await expect(page.getByTestId('report-errors').textContent()).resolves.toMatch(/1 of its 12 points is missing: \(T = 4, w = 2\); add the missing rows, or treat the table as scattered points/);
			await page.getByTestId('as-scatter').locator('input').check();
			await status.filter({ hasText: 'Ready to save' }).waitFor();
			await expect(page.getByTestId('shape').textContent()).resolves.toMatch(/scatter.*taken as scattered points, as asked/s);
			await shots(page, 'upload-holed-grid');
			await page.getByLabel('Name').fill(`Holed map ${tag}`);
			await page.getByRole('button', { name: 'Save dataset' }).click();
			await page.getByRole('heading', { level: 1, name: `Holed map ${tag}` }).waitFor();
			await expect(page.getByTestId('dataset-shape').textContent()).resolves.toBe('scatter');
			// the scatter's preview offers the RBF fits only
			await page.getByTestId('preview-map').locator('svg image').first().waitFor();
			await expect(page.getByLabel('Method').locator('option').allTextContents()).resolves.toEqual(expect.arrayContaining([expect.stringMatching(/rbf-thin-plate/)]));
			await expect(page.getByLabel('Method').locator('option', { hasText: 'grid-' }).count()).resolves.toBe(0);
			await page.close();
		} finally {
			await closeC();
		}
	});
});
