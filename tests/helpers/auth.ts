import { expect, type Browser, type Locator, type Page } from '@playwright/test';

export const DEMO_PASSWORD = 'bench-demo-2026';

/** The header's member menu (a <details>: its summary shows the member's picture or initials and name). */
export function memberMenu(page: Page): Locator {
	return page.locator('[data-site-header] [data-member-menu]');
}

/** Wait until the header shows a signed-in member (their menu), optionally this one by name. */
export async function expectSignedIn(page: Page, name?: string): Promise<void> {
	const summary = memberMenu(page).locator('summary');
	await expect(summary).toBeVisible();
	if (name) await expect(summary).toContainText(name);
}

/** Open the member menu (idempotent) and return its list of links and the Sign out button. */
export async function openMemberMenu(page: Page): Promise<Locator> {
	const menu = memberMenu(page);
	if ((await menu.getAttribute('open')) === null) await menu.locator('summary').click();
	const items = menu.locator('[data-member-menu-items]');
	await expect(items).toBeVisible();
	return items;
}

/** Sign out through the member menu and wait until the header offers "Sign in" again. */
export async function signOut(page: Page): Promise<void> {
	const items = await openMemberMenu(page);
	await items.getByRole('button', { name: 'Sign out' }).click();
	await expect(page.locator('[data-site-header]').getByRole('link', { name: 'Sign in' })).toBeVisible();
}

/** Sign in through the form and wait until the header shows the member. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expectSignedIn(page);
}

/** A fresh address for a test member. */
export function uniqueEmail(prefix: string): string {
	return `${prefix}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 7)}@example.test`;
}

/** A page in its own browser context, signed in as `email`. */
export async function signedInPage(browser: Browser, email: string): Promise<Page> {
	const ctx = await browser.newContext();
	const page = await ctx.newPage();
	await signIn(page, email);
	return page;
}
