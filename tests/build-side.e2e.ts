// The build side of the maker's workshop in Chromium: the build status (set in the editor, shown on the
// build page and its card, filtered on the browse page); /welcome after confirming the mail.
import { test, expect } from '@playwright/test';
import { signIn, uniqueEmail } from './helpers/auth';
import { createPublishedBuild } from './helpers/builds';
import { waitForMail, linkIn } from './helpers/mail';

const JOSS = 'joss@starground.test';

test('build status: set in the editor, shown on the build page and the card, filtered on the browse page', async ({ page }) => {
	test.setTimeout(90_000);
	await signIn(page, JOSS);
	const { slug, title } = await createPublishedBuild(page, { supply: false });
	await page.goto(`/builds/${slug}`);
	await expect(page.locator('[data-build] header [data-progress]')).toHaveText('In progress');

	await page.goto(`/builds/${slug}/edit`);
	const panel = page.locator('[data-progress-panel]');
	await panel.getByLabel('Working').check();
	await panel.getByRole('button', { name: 'Set status' }).click();
	await expect(page.getByText('Build status set to “Working”.')).toBeVisible();
	// No revision: nothing joins the pending changes.
	await expect(page.locator('[data-pending-changes]')).toHaveCount(0);

	await page.goto(`/builds/${slug}`);
	await expect(page.locator('[data-build] header [data-progress]')).toHaveText('Working');

	await page.goto('/builds?status=working');
	await expect(page.locator(`[data-build-card="${slug}"] [data-progress]`)).toHaveText('Working');
	await expect(page.getByRole('list', { name: 'Filters in force' })).toContainText('Working');
	for (const p of await page.locator('[data-build-card] [data-progress]').allTextContents()) expect(p.trim()).toBe('Working');

	// The filter form changes the list at once.
	await page.locator('[data-list-filters][data-ready="true"]').waitFor();
	await page.getByLabel('Build status').selectOption('abandoned');
	await expect(page).toHaveURL(/status=abandoned/);
	await expect(page.locator(`[data-build-card="${slug}"]`)).toHaveCount(0);
	expect(title).toBeTruthy();
});

test('/welcome after confirming the mail: signed in, or it says plainly how to sign in', async ({ page, browser }) => {
	test.setTimeout(90_000);
	const email = uniqueEmail('welcome');
	await page.goto('/sign-up');
	await page.getByLabel('Display name').fill('Wren Welcome');
	await page.getByLabel('Handle').fill(`wl${Date.now().toString(36)}`);
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('solder-and-flux-1');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByRole('heading', { name: 'Check your mail' })).toBeVisible();
	const link = linkIn(await waitForMail(email, /Confirm your e-mail/), '/api/auth/verify-email');

	// Confirmed in the browser that signed up: signed in, and the page says so.
	await page.goto(link);
	await expect(page.locator('[data-welcome]')).toHaveAttribute('data-welcome', 'signed-in');
	await expect(page.getByText('You are signed in.')).toBeVisible();
	await expect(page.getByRole('button', { name: 'Sign out' })).toBeVisible();

	// The same link again in another browser: not signed in there, and the page says how to sign in.
	const other = await browser.newContext();
	const p2 = await other.newPage();
	await p2.goto(link);
	await expect(p2).toHaveURL(/\/welcome/);
	await expect(p2.locator('[data-welcome]')).toHaveAttribute('data-welcome', 'signed-out');
	await expect(p2.getByText('sign in with the e-mail address and the password you chose')).toBeVisible();
	await p2.locator('[data-welcome]').getByRole('link', { name: 'Go to sign-in' }).click();
	await p2.getByLabel('E-mail').fill(email);
	await p2.getByLabel('Password').fill('solder-and-flux-1');
	await p2.getByRole('button', { name: 'Sign in' }).click();
	await expect(p2.getByRole('button', { name: 'Sign out' })).toBeVisible();

	// A link that cannot be used (cut short): the page says so and how to go on, never a bare error.
	const p3 = await (await browser.newContext()).newPage();
	await p3.goto(link.replace(/token=[^&]+/, 'token=cut-short'));
	await expect(p3.locator('[data-welcome]')).toHaveAttribute('data-welcome', 'invalid');
	await expect(p3.getByRole('heading', { name: 'That confirmation link cannot be used' })).toBeVisible();
	await expect(p3.locator('[data-welcome]').getByRole('link', { name: 'Go to sign-in' })).toBeVisible();
	await other.close();
});
