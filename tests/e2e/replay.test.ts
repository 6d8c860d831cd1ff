// The replay in Debian's Chromium, end to end: a new user signs up, uploads a
// CSV, launches a study over linear, Akima and PCHIP with SQP from five
// starts, watches it finish, opens the lockstep replay for one start, steps it
// to the end with the keyboard, sees linear end stalled on a marked knot and
// Akima converged, opens f″, and opens the same replay signed out through a
// share link. Screenshots at 1440 and 390 px under .data/screenshots/.
import { mkdirSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { DEMO_EMAIL, DEMO_PASSWORD, DEMO_WORKSPACE } from '../../seeds/01_demo_accounts';
import { BASE, expectContrast, launch } from './browser';

const SHOTS = '.data/screenshots';
const tag = randomBytes(4).toString('hex');
let context: BrowserContext;
let close: () => Promise<void>;

// INVENTED coarse propeller sweep (not measured data): the peak lies between table points
const CSV = ['J [-],eta [-]', '0.1,0.3', '0.3,0.58', '0.5,0.74', '0.7,0.83', '0.9,0.86', '1.1,0.8', '1.3,0.62', '1.5,0.3'].join('\n');

beforeAll(async () => {
	({ context, close } = await launch());
});
afterAll(async () => {
	await close?.();
});

const panel = (page: Page, fit: string) => page.locator(`[data-testid="replay-panel"][data-fit="${fit}"]`);

/** Step the replay to its last iteration with → alone, from wherever it is; the number of key presses. */
async function stepToEnd(page: Page): Promise<number> {
	await page.getByRole('button', { name: /^Step forward/ }).focus();
	const counter = page.getByTestId('replay-frame');
	const [, last] = (await counter.textContent())!.match(/\/ (\d+)/)!;
	let presses = 0;
	for (; presses <= Number(last) + 1; presses++) {
		const [, now] = (await counter.textContent())!.match(/(\d+) \//)!;
		if (now === last) break;
		await page.keyboard.press('ArrowRight');
	}
	await expect(counter.textContent()).resolves.toBe(`iteration ${last} / ${last}`);
	return presses;
}

/** What a finished lockstep replay must show: linear stalled on a marked knot, Akima and PCHIP converged. */
async function expectTheStory(page: Page) {
	const linear = panel(page, 'linear');
	await expect(linear.getAttribute('data-ended')).resolves.toBe('true');
	await expect(linear.getByTestId('panel-outcome').textContent()).resolves.toMatch(/ended\s+stalled at a kink/);
	await expect(linear.getByTestId('panel-kink').textContent()).resolves.toMatch(/stalled on the knot J = 0\.9: f′ jumps from 0\.15 to -0\.3/);
	// the knot is drawn on the chart, with the one-sided slopes
	await expect(linear.locator('[aria-description="stalled knot"]').count()).resolves.toBe(1);
	await expect(linear.locator('[aria-description="one-sided slopes"]').count()).resolves.toBe(1);
	for (const fit of ['akima', 'pchip']) {
		await expect(panel(page, fit).getAttribute('data-ended')).resolves.toBe('true');
		await expect(panel(page, fit).getByTestId('panel-outcome').textContent()).resolves.toMatch(/ended\s+converged/);
	}
	await expect(page.getByTestId('kink-explanation').first().textContent()).resolves.toMatch(/linear stalls on the knot at J = 0\.9\..*no gradient is zero/);
	// and a screen reader hears it
	await expect(page.getByTestId('replay-announce').textContent()).resolves.toMatch(/linear ended stalled at a kink; akima ended converged; pchip ended converged/);
}

async function shots(page: Page, name: string) {
	mkdirSync(SHOTS, { recursive: true });
	for (const width of [1440, 390]) {
		await page.setViewportSize({ width, height: 1000 });
		await page.waitForTimeout(300); // the charts redraw at the new width
		// tall enough for the whole replay, so the shot is not taken scrolled (the controls stick to the top when scrolled)
		const box = await page.getByTestId('replay').boundingBox();
		await page.setViewportSize({ width, height: Math.ceil((box?.height ?? 1000) + 200) });
		await page.getByTestId('replay').scrollIntoViewIfNeeded();
		await page.getByTestId('replay').screenshot({ path: `${SHOTS}/${name}-${width}.png` });
		const wide = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
		expect(wide, `${name} scrolls sideways at ${width} px`).toBeLessThanOrEqual(0);
	}
	await page.setViewportSize({ width: 1280, height: 900 });
}

describe('the replay in the browser', () => {
	it('from sign-up to a shared replay: linear stalls on a knot, Akima converges', async () => {
		const page = await context.newPage();
		// sign up and a workspace
		await page.goto('/signup');
		await page.getByLabel('Name').fill('Replay Person');
		await page.getByLabel('E-mail').fill(`replay-${tag}@test.example`);
		await page.getByLabel('Password').fill('replay-password-1');
		await page.getByRole('button', { name: 'Create account' }).click();
		await page.getByRole('heading', { name: 'Your workspaces' }).waitFor();
		await page.getByLabel('Name').fill(`Replay Lab ${tag}`);
		await page.getByRole('button', { name: 'Create workspace' }).click();
		await page.getByRole('heading', { name: `Replay Lab ${tag}` }).waitFor();
		const workspaceUrl = page.url();

		// upload the CSV
		await page.getByRole('link', { name: 'Upload a dataset' }).click();
		await page.getByLabel('Choose a file').setInputFiles({ name: 'prop-coarse.csv', mimeType: 'text/csv', buffer: Buffer.from(CSV) });
		await page.getByTestId('report-status').filter({ hasText: 'Ready to save' }).waitFor();
		await page.getByLabel('Name').fill(`Coarse prop ${tag}`);
		await page.getByRole('button', { name: 'Save dataset' }).click();
		await page.getByRole('heading', { level: 1, name: `Coarse prop ${tag}` }).waitFor();

		// launch: linear, Akima, PCHIP × SQP × five starts
		await page.goto(workspaceUrl);
		await page.getByRole('link', { name: 'New study' }).click();
		await page.getByRole('heading', { name: 'New study' }).waitFor();
		await page.getByLabel('Study name').fill(`Replay study ${tag}`);
		await page.locator('input[name="kind"][value="maximize"]').check();
		for (const f of ['linear', 'akima', 'pchip']) await page.locator(`input[name="fit.${f}"]`).check();
		for (const f of ['cubic-natural', 'softened-linear']) await page.locator(`input[name="fit.${f}"]`).uncheck();
		await page.locator('input[name="opt.sqp"]').check();
		await page.locator('input[name="opt.bfgs"]').uncheck();
		await page.getByLabel('Number of starts').fill('5');
		await page.getByRole('button', { name: 'Launch study' }).click();
		await page.waitForURL(/\/studies\/[0-9a-f-]{36}$/);
		const studyUrl = page.url();

		// the progress bar, then the results
		const bar = page.getByRole('progressbar', { name: 'Runs stored' });
		await page.getByRole('heading', { name: 'Scorecard' }).waitFor({ timeout: 90_000 });
		await bar.waitFor({ state: 'detached', timeout: 15_000 });
		await expect(page.getByTestId('study-status').textContent()).resolves.toBe('done');

		// one start where linear stalled at a kink (read from the runs API, as a reader would from the table)
		const studyId = studyUrl.split('/').at(-1)!;
		const { runs } = (await (await context.request.get(`/api/v1/studies/${studyId}/runs`)).json()) as { runs: { method: string; start: number[]; outcome: string; atKink: boolean }[] };
		expect(runs).toHaveLength(15);
		const stall = runs.find((r) => r.method === 'linear' && r.outcome === 'stalled' && r.atKink);
		expect(stall, 'linear stalls at a kink from some start').toBeDefined();
		const startLabel = (await page.getByTestId('replay-start').locator('option').allTextContents()).find((t) => t.endsWith(`= ${Number(stall!.start[0].toPrecision(4))}`));
		expect(startLabel).toBeDefined();
		const [startValue] = await page.getByTestId('replay-start').selectOption({ label: startLabel! });
		await page.locator(`[data-testid="replay-panels"][data-start="${startValue}"]`).waitFor();

		// the lockstep replay: one panel per fit, each labelled, same start
		await panel(page, 'linear').waitFor();
		await expect(page.getByTestId('replay-panel').count()).resolves.toBe(3);
		for (const fit of ['linear', 'akima', 'pchip']) await expect(panel(page, fit).locator('figcaption').textContent()).resolves.toMatch(new RegExp(`${fit}\\s+iteration 0 of \\d+`));
		// paths are fetched on demand from the path API
		const presses = await stepToEnd(page);
		expect(presses).toBeGreaterThan(2);
		await expectTheStory(page);
		// Home goes back to the start, Space plays (and the clock moves), Space pauses; ] is faster
		await page.keyboard.press('Home');
		await expect(page.getByTestId('replay-frame').textContent()).resolves.toMatch(/^iteration 0 \//);
		await page.keyboard.press(']');
		await expect(page.getByTestId('replay-speed').textContent()).resolves.toBe('2×');
		await page.keyboard.press('[');
		await expect(page.getByTestId('replay-speed').textContent()).resolves.toBe('1×');
		await page.keyboard.press(' ');
		await page.getByTestId('replay-frame').filter({ hasNotText: /^iteration 0 \// }).waitFor();
		await page.keyboard.press(' ');
		await expect(page.getByRole('button', { name: 'Play (Space)' }).count()).resolves.toBe(1);
		await page.keyboard.press('End');
		await expectTheStory(page);

		// f″: the panel opens, drawn over the same x axis
		await page.getByTestId('toggle-d2').click();
		await page.getByTestId('replay-d2').locator('svg').first().waitFor();
		await expect(page.getByTestId('toggle-d2').getAttribute('aria-expanded')).resolves.toBe('true');
		await expect(page.getByTestId('replay-convergence').locator('svg').count()).resolves.toBeGreaterThanOrEqual(2);
		await expectContrast(page, '[data-testid="replay"]', 'the replay');
		await shots(page, 'replay');

		// a scorecard row opens its fit in the replay, focus on Play so the keys work at once
		await page.getByTestId('scorecard').getByRole('button', { name: 'Replay akima with sqp' }).click();
		await expect(panel(page, 'akima').getAttribute('class')).resolves.toMatch(/ring-2/);
		await expect(page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).resolves.toBe('replay-play');
		// a runs-table row opens that run: its start, its fit brought forward
		const other = runs.findIndex((r) => r.method === 'pchip' && r.start[0] !== stall!.start[0]);
		const row = page.getByTestId('runs').locator('tbody tr').filter({ hasText: 'pchip' }).filter({ hasText: String(Number(runs[other].start[0].toPrecision(4))) });
		await row.getByTestId('run-replay').click();
		await expect(page.getByTestId('replay-start').inputValue()).resolves.not.toBe(startValue);
		await expect(panel(page, 'pchip').getAttribute('class')).resolves.toMatch(/ring-2/);
		await page.keyboard.press('End');
		await expect(panel(page, 'pchip').getAttribute('data-ended')).resolves.toBe('true');

		// the same replay signed out, through a share link
		await page.getByRole('button', { name: 'Make a link' }).click();
		const url = await page.getByTestId('share-url').getAttribute('href');
		expect(url).toMatch(new RegExp(`^${BASE}/shared/[A-Za-z0-9_-]{40,}$`));
		const { context: stranger, close: closeStranger } = await launch();
		try {
			const other = await stranger.newPage();
			const asked: string[] = [];
			other.on('request', (r) => {
				if (/\/path$/.test(new URL(r.url()).pathname)) asked.push(new URL(r.url()).pathname);
			});
			await other.goto(url!);
			await other.getByRole('heading', { name: `Replay study ${tag}` }).waitFor();
			await other.getByTestId('replay-start').selectOption({ label: startLabel! });
			await other.locator(`[data-testid="replay-panels"][data-start="${startValue}"]`).waitFor();
			await panel(other, 'linear').waitFor();
			await stepToEnd(other);
			await expectTheStory(other);
			expect(asked.length).toBeGreaterThanOrEqual(3);
			for (const p of asked) expect(p).toMatch(/^\/api\/v1\/shared\/[A-Za-z0-9_-]+\/runs\/[0-9a-f-]{36}\/path$/);
			await expect(other.getByRole('button', { name: 'Record the pick' }).count()).resolves.toBe(0);
			// a reader who asks for less motion gets whole steps
			await other.emulateMedia({ reducedMotion: 'reduce' });
			await other.getByText('reduced motion: whole steps only').waitFor();
			await shots(other, 'replay-shared');
		} finally {
			await closeStranger();
		}
		await page.close();
	});

	it('the demo tells the story on first look: minimum drag opens where linear stalls on a knot and the smooth fits converge; a solve shows its target', async () => {
		const { context: demo, close: closeDemo } = await launch();
		try {
			expect((await demo.request.post('/api/v1/session', { data: { email: DEMO_EMAIL, password: DEMO_PASSWORD } })).status()).toBe(200);
			const { studies } = (await (await demo.request.get(`/api/v1/workspaces/${DEMO_WORKSPACE}/studies`)).json()) as { studies: { id: string; name: string }[] };
			const page = await demo.newPage();
			const wing = studies.find((s) => s.name === 'Wing: minimum drag');
			expect(wing, 'the seeded minimum-drag study').toBeDefined();
			await page.goto(`/w/${DEMO_WORKSPACE}/studies/${wing!.id}`);
			// no choice made: the replay opens on its own telling start with the first optimizer
			await panel(page, 'linear').waitFor();
			await page.getByRole('button', { name: 'Last iteration (End)' }).click();
			await expect(panel(page, 'linear').getByTestId('panel-outcome').textContent()).resolves.toMatch(/ended\s+stalled at a kink/);
			await expect(panel(page, 'linear').locator('[aria-description="stalled knot"]').count()).resolves.toBe(1);
			for (const fit of ['akima', 'pchip', 'cubic-natural', 'smoothing-spline']) await expect(panel(page, fit).getByTestId('panel-outcome').textContent()).resolves.toMatch(/ended\s+converged/);
			await shots(page, 'replay-demo-wing');

			const battery = studies.find((s) => /Battery pack/.test(s.name));
			expect(battery, 'the seeded solve study').toBeDefined();
			await page.goto(`/w/${DEMO_WORKSPACE}/studies/${battery!.id}`);
			await panel(page, 'linear').waitFor();
			await expect(panel(page, 'linear').locator('[aria-description="target"]').count()).resolves.toBe(1);
			await expect(page.getByTestId('replay-convergence').textContent()).resolves.toContain('Distance from the target');
			await page.close();
		} finally {
			await closeDemo();
		}
	});
});
