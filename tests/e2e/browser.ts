// Debian's Chromium driven by playwright-core against the built app `npm test` started.
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { expect } from 'vitest';
import os from 'node:os';
import path from 'node:path';

export const BASE = process.env.KINKLESS_TEST_URL ?? '';
if (!BASE) throw new Error('KINKLESS_TEST_URL is not set: run the browser tests through `npm test`');

export async function launch(): Promise<{ context: BrowserContext; close: () => Promise<void> }> {
	const dir = mkdtempSync(path.join(os.tmpdir(), 'kinkless-chromium-'));
	const context = await chromium.launchPersistentContext(dir, {
		executablePath: '/usr/bin/chromium',
		headless: true,
		baseURL: BASE,
		viewport: { width: 1280, height: 900 },
		args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync']
	});
	// Every browser test also checks the content policy: a script or style the policy
	// refused (a broken page in production) fails the test when its browser closes.
	const refused: string[] = [];
	const watch = (page: import('playwright-core').Page) =>
		page.on('console', (msg) => {
			if (msg.type() === 'error' && /Content Security Policy/i.test(msg.text())) refused.push(`${page.url()}: ${msg.text()}`);
		});
	context.pages().forEach(watch);
	context.on('page', watch);
	return {
		context,
		close: async () => {
			await context.close();
			rmSync(dir, { recursive: true, force: true });
			if (refused.length) throw new Error(`the content security policy refused:\n${refused.join('\n')}`);
		}
	};
}

/** INVENTED coarse propeller sweep (not measured data): a minimum between knots, the browser tests' usual table. */
export function propSweep(name: string) {
	return {
		name,
		columns: [
			{ name: 'J', unit: '-', role: 'input' },
			{ name: 'eta', unit: '-', role: 'output' }
		],
		rows: [
			[0.1, 0.3],
			[0.3, 0.58],
			[0.5, 0.74],
			[0.7, 0.83],
			[0.9, 0.86],
			[1.1, 0.8],
			[1.3, 0.62],
			[1.5, 0.3]
		]
	};
}

/** Sign up and sign in through the API in the browser's cookie jar, create a workspace and a dataset; their slug and id. */
export async function apiTeamWithDataset(context: BrowserContext, who: { email: string; password: string; name: string; workspace: string }, dataset: unknown): Promise<{ slug: string; datasetId: string }> {
	const { email, password, name } = who;
	const check = (status: number, want: number, what: string) => {
		if (status !== want) throw new Error(`${what}: expected ${want}, got ${status}`);
	};
	check((await context.request.post('/api/v1/users', { data: { email, password, name } })).status(), 201, 'sign-up');
	check((await context.request.post('/api/v1/session', { data: { email, password } })).status(), 200, 'sign-in');
	const slug = (await (await context.request.post('/api/v1/workspaces', { data: { name: who.workspace } })).json()).slug;
	const ds = await context.request.post(`/api/v1/workspaces/${slug}/datasets`, { data: dataset });
	check(ds.status(), 201, 'dataset upload');
	return { slug, datasetId: (await ds.json()).id };
}

const AXE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

/** axe-core's contrast rule over one region of the page, run through the debugging protocol (the page's content policy would refuse an injected script). */
export async function expectContrast(page: Page, selector: string, what: string) {
	await page.evaluate(AXE);
	const violations = await page.evaluate(async (sel) => {
		// eslint-disable-next-line @typescript-eslint/no-explicit-any
		const axe = (window as any).axe;
		const r = await axe.run(document.querySelector(sel), { runOnly: { type: 'rule', values: ['color-contrast'] } });
		// eslint-disable-next-line @typescript-eslint/no-explicit-any
		return r.violations.flatMap((v: any) => v.nodes.map((n: any) => `${n.target.join(' ')}: ${n.failureSummary.split('\n').slice(1).join(' ')}`));
	}, selector);
	expect(violations, `${what}: text below WCAG AA contrast`).toEqual([]);
}
