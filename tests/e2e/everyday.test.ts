// Everyday use in Debian's Chromium: the scorecard verdict, one live status,
// the pick form's errors beside the field, copy buttons, the revoked-link
// page, and every page at 1440 and 390 px — no sideways scroll at phone
// width, every text at WCAG AA contrast (axe-core's color-contrast rule,
// run in the page), screenshots saved under .data/screenshots/.
import { mkdirSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { apiTeamWithDataset, launch, propSweep } from './browser';

const AXE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');
const SHOTS = '.data/screenshots';

let context: BrowserContext;
let close: () => Promise<void>;
const tag = randomBytes(4).toString('hex');
let slug = '';
let datasetId = '';
let studyId = '';

const PROP = propSweep(`Everyday prop ${tag} (invented)`);
const NINE = ['linear', 'cubic-natural', 'cubic-not-a-knot', 'akima', 'akima-modified', 'pchip', 'local-cubic', 'polynomial-global', 'smoothing-spline'];

async function waitDone(id: string) {
	for (let i = 0; i < 300; i++) {
		const s = await (await context.request.get(`/api/v1/studies/${id}`)).json();
		if (s.status === 'done') return s;
		if (s.status === 'failed') throw new Error(`study failed: ${s.error}`);
		await new Promise((r) => setTimeout(r, 500));
	}
	throw new Error('study did not finish');
}

beforeAll(async () => {
	({ context, close } = await launch());
	({ slug, datasetId } = await apiTeamWithDataset(context, { email: `everyday-${tag}@test.example`, password: 'everyday-password-1', name: 'Everyday Person', workspace: `Everyday ${tag}` }, PROP));
	const st = await context.request.post(`/api/v1/workspaces/${slug}/studies`, {
		data: { name: `Nine fits ${tag}`, datasetId, output: 'eta', problem: { kind: 'maximize' }, fits: NINE.map((method) => ({ method })), optimizers: [{ method: 'sqp' }], starts: { latinHypercube: 16, seed: 3 } }
	});
	expect(st.status()).toBe(202);
	studyId = (await st.json()).id;
	await waitDone(studyId);
});
afterAll(async () => {
	await close?.();
});

/** At 1440 and 390 px: screenshot, no sideways scroll at 390, and axe-core's contrast rule passes. */
async function checkPage(page: Page, name: string, url?: string) {
	mkdirSync(SHOTS, { recursive: true });
	for (const width of [1440, 390]) {
		await page.setViewportSize({ width, height: 900 });
		if (url) await page.goto(url);
		await page.waitForLoadState('networkidle');
		await page.screenshot({ path: `${SHOTS}/${name}-${width}.png`, fullPage: true });
		if (width === 390) {
			const wide = await page.evaluate(() => {
				const view = window.innerWidth;
				// the outermost elements that stick out, to name in the failure
				const out = [...document.querySelectorAll('body *')]
					.filter((e) => e.getBoundingClientRect().right > view + 0.5 && !(e.parentElement && e.parentElement.getBoundingClientRect().right > view + 0.5))
					.slice(0, 5)
					.map((e) => `${e.tagName.toLowerCase()}.${[...e.classList].join('.')} (${Math.round(e.getBoundingClientRect().right)} px)`);
				const chain: string[] = [];
				for (let e: Element | null = document.querySelector('table'); e; e = e.parentElement) {
					const cs = getComputedStyle(e);
					chain.push(`${e.tagName.toLowerCase()}.${[...e.classList].slice(0, 3).join('.')}[${Math.round(e.getBoundingClientRect().width)} ${cs.display} ${cs.overflowX}]`);
				}
				return { page: document.documentElement.scrollWidth, view, out: [...out, chain.join(' < ')] };
			});
			expect(wide.page, `${name} scrolls sideways at 390 px: ${wide.out.join('; ')}`).toBeLessThanOrEqual(wide.view);
		}
		// evaluated through the debugging protocol, which the page's content policy does not govern (an injected <script> would be refused)
		await page.evaluate(AXE);
		const violations = await page.evaluate(async () => {
			// eslint-disable-next-line @typescript-eslint/no-explicit-any
			const axe = (window as any).axe;
			const r = await axe.run(document, { runOnly: { type: 'rule', values: ['color-contrast'] } });
			// eslint-disable-next-line @typescript-eslint/no-explicit-any
			return r.violations.flatMap((v: any) => v.nodes.map((n: any) => `${n.target.join(' ')}: ${n.failureSummary.split('\n').slice(1).join(' ')}`));
		});
		expect(violations, `${name} at ${width} px: text below WCAG AA contrast`).toEqual([]);
	}
}

describe('everyday use in the browser', () => {
	it('the scorecard gives each fit a verdict, states the rule, and never ranks split optima first without saying so', async () => {
		const page = await context.newPage();
		await page.goto(`/w/${slug}/studies/${studyId}`);
		await page.getByRole('heading', { name: 'Scorecard' }).waitFor();
		await expect(page.getByTestId('rank-rule').textContent()).resolves.toMatch(/verdict.*unfaithful to the data.*separate points/s);
		const rows = page.getByTestId('scorecard').locator('tbody tr');
		expect(await rows.count()).toBe(9);
		const verdicts = await page.getByTestId('verdict').allTextContents();
		expect(verdicts.every((v) => v.trim().length > 0 && v.trim() !== '—')).toBe(true);
		const optima = await page.getByTestId('optima').allTextContents();
		// rank 1 has one optimum, or the page says above the table that its optima are split
		if (Number.parseInt(optima[0].trim(), 10) > 1) await expect(page.getByTestId('first-split').isVisible()).resolves.toBe(true);
		else await expect(page.getByTestId('first-split').count()).resolves.toBe(0);
		// the spurious-extrema column is there, and the global polynomial through 8 points is not first
		await expect(page.getByTestId('scorecard').getByRole('columnheader', { name: /Spurious/ }).count()).resolves.toBe(1);
		const first = await rows.first().locator('td').nth(1).textContent();
		expect(first).not.toMatch(/polynomial-global/);
		// monotone: the data rise then fall, so never a bare "kept"
		const mono = await page.getByTestId('monotone').allTextContents();
		expect(mono.some((m) => m.trim() === 'kept')).toBe(false);
		expect(mono.some((m) => /not applicable \(data not monotone\)/.test(m))).toBe(true);
		await checkPage(page, 'study');
		await page.close();
	});

	it('one live status while a study runs; after it finishes the pick form has a fit and shows its error beside the field, focused', async () => {
		const r = await context.request.post(`/api/v1/workspaces/${slug}/studies`, {
			data: { name: `Watched ${tag}`, datasetId, output: 'eta', problem: { kind: 'maximize' }, fits: [{ method: 'linear' }, { method: 'pchip' }, { method: 'akima' }, { method: 'cubic-natural' }], optimizers: [{ method: 'sqp' }, { method: 'nelder-mead' }], starts: { latinHypercube: 1000, seed: 5 } }
		});
		expect(r.status()).toBe(202);
		const { id } = await r.json();
		const page = await context.newPage();
		await page.goto(`/w/${slug}/studies/${id}`);
		const bar = page.getByRole('progressbar', { name: 'Runs stored' });
		for (let i = 0; i < 40 && (await bar.isVisible()); i++) {
			const [badge, heading, counts] = await Promise.all([page.getByTestId('study-status').textContent(), page.locator('#progress-h').textContent().catch(() => null), page.getByTestId('progress-counts').textContent().catch(() => null)]);
			if (heading === null || counts === null) break;
			// the badge and the panel read one source: "Running" with runs stored is never a "queued" badge
			// "Running 3,100 of 20,000" never sits beside a "queued" badge: both read one source
			if (/^[1-9][\d,]* of/.test(counts.trim())) expect(badge).not.toBe('queued');
			expect(heading.startsWith('Waiting') ? 'queued' : heading.startsWith('Running') ? 'running' : 'ended').toBe(badge === 'queued' || badge === 'running' ? badge : 'ended');
			await page.waitForTimeout(250);
		}
		await page.getByRole('heading', { name: 'Scorecard' }).waitFor({ timeout: 150_000 });
		await expect(page.getByTestId('study-status').textContent()).resolves.toBe('done');

		// the pick form pre-selects the first-ranked fit once the scorecard is in
		const chosen = await page.getByLabel('Fit to pick').inputValue();
		expect(chosen).toMatch(/^[0-9a-f-]{36}$/);
		// a rationale of spaces passes the browser's length check but not the server's: the problem shows beside the field
		await page.getByLabel('Rationale').fill('            ');
		await page.getByRole('button', { name: 'Record the pick' }).click();
		const err = page.getByTestId('pick-rationale-error');
		await err.waitFor();
		await expect(err.textContent()).resolves.toMatch(/at least 10 characters/);
		await expect(page.getByLabel('Rationale').getAttribute('aria-invalid')).resolves.toBe('true');
		await expect(page.evaluate(() => document.activeElement?.id)).resolves.toBe('pick-rationale');
		const [e, b] = await Promise.all([err.boundingBox(), page.getByRole('button', { name: 'Record the pick' }).boundingBox()]);
		expect(Math.abs(e!.y - b!.y)).toBeLessThan(250);
		await page.close();
	});

	it('copy buttons beside a new share link and a new API token; the revoked link offers a signed-out reader no workspaces', async () => {
		await context.grantPermissions(['clipboard-read', 'clipboard-write']);
		const page = await context.newPage();
		await page.goto(`/w/${slug}/studies/${studyId}`);
		await page.getByRole('button', { name: 'Make a link' }).click();
		const url = (await page.getByTestId('share-url').getAttribute('href'))!;
		await page.getByRole('button', { name: 'Copy link' }).click();
		await page.getByText('Copied.').waitFor();
		await expect(page.evaluate(() => navigator.clipboard.readText())).resolves.toBe(url);

		await page.goto('/settings');
		await page.getByLabel('Token name').fill(`copy ${tag}`);
		await page.getByRole('button', { name: 'Create token' }).click();
		const token = (await page.getByTestId('new-token').textContent())!.trim();
		await page.getByRole('button', { name: 'Copy token' }).click();
		await page.getByText('Copied.').waitFor();
		await expect(page.evaluate(() => navigator.clipboard.readText())).resolves.toBe(token);
		await checkPage(page, 'settings');

		const { context: stranger, close: closeStranger } = await launch();
		try {
			const other = await stranger.newPage();
			await other.goto(url);
			await other.getByRole('heading', { name: 'Scorecard' }).waitFor();
			await checkPage(other, 'shared');
			await page.goto(`/w/${slug}/studies/${studyId}`);
			await page.getByRole('button', { name: 'Revoke the link' }).click();
			await page.getByRole('status').filter({ hasText: 'Link revoked.' }).waitFor();
			expect((await other.goto(url))?.status()).toBe(404);
			await expect(other.getByText('your workspaces').count()).resolves.toBe(0);
			await expect(other.locator('main').textContent()).resolves.toMatch(/revoked/);
			await expect(other.getByTestId('signed-out-links').textContent()).resolves.toMatch(/Kinkless home.*Sign in/s);
			await checkPage(other, 'shared-revoked');
			for (const [name, path] of [
				['landing', '/'],
				['login', '/login'],
				['signup', '/signup'],
				['reset-password', '/reset-password']
			])
				await checkPage(other, name, path);
		} finally {
			await closeStranger();
		}
		await page.close();
	});

	it('every signed-in page: no sideways scroll at 390 px, AA contrast, screenshots at both widths', async () => {
		const page = await context.newPage();
		for (const [name, path] of [
			['home', '/'],
			['workspace', `/w/${slug}`],
			['dataset-new', `/w/${slug}/datasets/new`],
			['dataset', `/w/${slug}/datasets/${datasetId}`],
			['study-new', `/w/${slug}/studies/new`],
			['study-page', `/w/${slug}/studies/${studyId}`],
			['not-found', `/w/${slug}/studies/00000000-0000-0000-0000-000000000000`]
		])
			await checkPage(page, name, path);
		await page.close();
	});

	it('the demo workspace tells a finished story, and the new-study form starts from what the dataset is for', async () => {
		const { context: demo, close: closeDemo } = await launch();
		try {
			expect((await demo.request.post('/api/v1/session', { data: { email: 'demo@larkmoor.example', password: 'larkmoor-demo-2026' } })).status()).toBe(200);
			const page = await demo.newPage();
			await page.goto('/w/larkmoor-aero');
			await page.getByRole('link', { name: 'Propeller: peak efficiency' }).click();
			await page.getByRole('heading', { name: /^Picked: / }).waitFor();
			await expect(page.locator('blockquote').textContent()).resolves.toMatch(/ranks first: .*% of \d+ runs converge/s);
			await checkPage(page, 'demo-study');
			await page.goto('/w/larkmoor-aero/studies/new');
			const source = page.getByLabel('Dataset and output');
			const battery = await source.locator('option', { hasText: 'Battery pack' }).first().getAttribute('value');
			await source.selectOption(battery!);
			await expect(page.getByRole('radio', { name: /^Solve/ }).isChecked()).resolves.toBe(true);
			await expect(page.getByLabel('Target value').inputValue()).resolves.toBe('300');
			const wing = await source.locator('option', { hasText: 'Wing drag' }).first().getAttribute('value');
			await source.selectOption(wing!);
			await expect(page.getByRole('radio', { name: 'Minimize' }).isChecked()).resolves.toBe(true);
			await checkPage(page, 'demo-study-new');
		} finally {
			await closeDemo();
		}
	});
});
