// Debian's Chromium driven by playwright-core against the built app `npm test` started.
import { chromium, type BrowserContext } from 'playwright-core';
import { mkdtempSync, rmSync } from 'node:fs';
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
	return {
		context,
		close: async () => {
			await context.close();
			rmSync(dir, { recursive: true, force: true });
		}
	};
}
