import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext } from 'playwright-core';
import { launch } from './browser';
import { caughtMail, linkIn, testDb } from '../integration/client';

let context: BrowserContext;
let close: () => Promise<void>;
beforeAll(async () => {
	({ context, close } = await launch());
});
afterAll(async () => {
	await close?.();
	await testDb().destroy();
});

const tag = randomBytes(4).toString('hex');

describe('foundation in the browser', () => {
	it('the landing page says what Kinkless does, and the demo sign-in works', async () => {
		const page = await context.newPage();
		await page.goto('/');
		await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toMatch(/fits your optimizer can trust/);
		await page.getByRole('link', { name: 'Sign in' }).first().click();
		await page.getByLabel('E-mail').fill('demo@larkmoor.example');
		await page.getByLabel('Password').fill('larkmoor-demo-2026');
		await page.getByRole('button', { name: 'Sign in' }).click();
		await page.getByRole('link', { name: 'Larkmoor Aero (demo)' }).waitFor();
		// the seeded demo studies are listed on the signed-in home page
		await page.getByRole('heading', { name: 'Recent studies' }).waitFor();
		expect(await page.getByText('Larkmoor Aero (demo) · done').count()).toBeGreaterThan(0);
		await page.getByRole('button', { name: 'Sign out' }).click();
		await page.getByRole('link', { name: 'Create an account' }).first().waitFor();
		await page.close();
	});

	it('signs up, creates a workspace, invites a second address, and the second user accepts from the caught e-mail', async () => {
		const owner = `owner-${tag}@test.example`;
		const second = `second-${tag}@test.example`;
		const page = await context.newPage();
		await page.goto('/signup');
		await page.getByLabel('Name').fill('Owner Person');
		await page.getByLabel('E-mail').fill(owner);
		await page.getByLabel('Password').fill('owner-password-1');
		await page.getByRole('button', { name: 'Create account' }).click();
		await page.getByRole('heading', { name: 'Your workspaces' }).waitFor();

		await page.getByLabel('Name').fill(`Fan Rig ${tag}`);
		await page.getByRole('button', { name: 'Create workspace' }).click();
		await page.getByRole('heading', { name: `Fan Rig ${tag}` }).waitFor();
		const workspaceUrl = page.url();

		await page.getByLabel('E-mail').fill(second);
		await page.getByLabel('Role', { exact: true }).selectOption('editor');
		await page.getByRole('button', { name: 'Send invitation' }).click();
		await page.getByRole('status').filter({ hasText: `Invitation sent to ${second}` }).waitFor();

		// the owner's mail viewer shows only the owner's own mail, never the invitation to someone else
		await page.goto('/dev/mail');
		await page.getByRole('heading', { name: 'Caught mail' }).waitFor();
		await expect(page.getByTestId('mail').filter({ hasText: second }).count()).resolves.toBe(0);
		await page.getByRole('button', { name: 'Sign out' }).click();
		// the invitation as it reached the invitee's mailbox (the catcher's store)
		const inviteUrl = linkIn((await caughtMail(second)).text, '/invite').url;
		expect(inviteUrl).toMatch(/\/invite\/[A-Za-z0-9_-]{20,}$/);

		// the second person opens the link, signs up on the way, and accepts
		await page.goto(inviteUrl!);
		await page.getByText(`invited ${second}`, { exact: false }).waitFor();
		await page.getByRole('link', { name: 'Create an account to accept' }).click();
		await expect(page.getByLabel('E-mail').inputValue()).resolves.toBe(second);
		await page.getByLabel('Name').fill('Second Person');
		await page.getByLabel('Password').fill('second-password-2');
		await page.getByRole('button', { name: 'Create account' }).click();
		await page.getByRole('button', { name: 'Accept and open the workspace' }).click();
		await page.getByRole('heading', { name: `Fan Rig ${tag}` }).waitFor();
		expect(page.url()).toBe(workspaceUrl);
		await expect(page.getByText('You are editor').isVisible()).resolves.toBe(true);
		await page.close();
	});

	it('keyboard users reach the navigation with a visible focus ring', async () => {
		const page = await context.newPage();
		await page.goto('/');
		await page.keyboard.press('Tab');
		const focused = await page.evaluate(() => document.activeElement?.textContent?.trim());
		expect(focused).toBe('Skip to content');
		await page.keyboard.press('Tab');
		const outline = await page.evaluate(() => getComputedStyle(document.activeElement!).outlineStyle);
		expect(outline).toBe('solid');
		await page.close();
	});
});
