import { expect, type Browser, type Page } from '@playwright/test';

export const DEMO_PASSWORD = 'bench-demo-2026';

/** Sign in through the form and wait until the header shows the member. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('button', { name: 'Sign out' })).toBeVisible();
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
