import { test, expect } from '@playwright/test';
import { waitForMail, linkIn } from './helpers/mail';
import { expectSignedIn, memberMenu, signIn, signOut, uniqueEmail, DEMO_PASSWORD } from './helpers/auth';

test('sign up, confirm by mail, sign out, sign in again', async ({ page }) => {
	const email = uniqueEmail('newcomer');
	const handle = `nc${Date.now().toString(36)}`;
	await page.goto('/sign-up');
	await page.getByLabel('Display name').fill('Nadia Newcomer');
	await page.getByLabel('Handle').fill(handle);
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('solder-and-flux-1');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByRole('heading', { name: 'Check your mail' })).toBeVisible();

	const mail = await waitForMail(email, /Confirm your e-mail/);
	expect(mail.html).toContain('Confirm my e-mail');
	await page.goto(linkIn(mail, '/api/auth/verify-email'));
	await expect(page.getByRole('heading', { name: 'Your e-mail is confirmed' })).toBeVisible();
	await expectSignedIn(page, 'Nadia Newcomer');

	await signOut(page);
	await expect(memberMenu(page)).toHaveCount(0);
	await signIn(page, email, 'solder-and-flux-1');
	await expectSignedIn(page, 'Nadia Newcomer');
});

test('sign-up refuses malformed input field by field and creates nothing', async ({ page, request }) => {
	const email = uniqueEmail('bad');
	await page.goto('/sign-up');
	await page.getByLabel('Display name').fill('X');
	await page.getByLabel('Handle').fill('a!');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('short');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByText('Letters, digits and dashes')).toBeVisible();
	await expect(page.getByText('Use at least 12 characters.')).toBeVisible();
	await expect(page.getByLabel('Password')).toHaveAttribute('aria-invalid', 'true');
	// Nothing was created: signing in with that address is refused as unknown.
	const res = await request.post('/api/auth/sign-in/email', {
		data: { email, password: 'short-but-irrelevant' },
		headers: { origin: new URL(page.url()).origin }
	});
	expect(res.status()).toBe(401);
});

test('password reset through the mailed link', async ({ page }) => {
	const email = uniqueEmail('forgetful');
	await page.goto('/sign-up');
	await page.getByLabel('Display name').fill('Forgetful Fen');
	await page.getByLabel('Handle').fill(`ff${Date.now().toString(36)}`);
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('first-password-1');
	await page.getByRole('button', { name: 'Create account' }).click();
	await page.goto(linkIn(await waitForMail(email, /Confirm your e-mail/), '/api/auth/verify-email'));
	await signOut(page);

	await page.goto('/forgot-password');
	await page.getByLabel('E-mail').fill(email);
	await page.getByRole('button', { name: 'Send reset link' }).click();
	await expect(page.getByText('a reset link is on its way')).toBeVisible();
	const mail = await waitForMail(email, /Reset your Starground password/);
	await page.goto(linkIn(mail, '/reset-password'));
	await page.getByLabel('New password', { exact: true }).fill('second-password-2');
	await page.getByLabel('Repeat the new password').fill('second-password-2');
	await page.getByRole('button', { name: 'Save password' }).click();
	await expect(page).toHaveURL(/\/sign-in/);
	await signIn(page, email, 'second-password-2');
});

test('a maker is refused the members page by the server', async ({ page }) => {
	await signIn(page, 'joss@starground.test');
	const res = await page.goto('/admin/members');
	expect(res?.status()).toBe(403);
	await expect(page.getByRole('link', { name: 'Members' })).toHaveCount(0);
});

test('a suspended member cannot sign in; restored, they can', async ({ browser }) => {
	// A fresh member, so other tests' demo accounts stay usable.
	const email = uniqueEmail('suspendme');
	const handle = `sus${Date.now().toString(36)}`;
	const ctx = await browser.newContext();
	const page = await ctx.newPage();
	await page.goto('/sign-up');
	await page.getByLabel('Display name').fill('Sam Suspended');
	await page.getByLabel('Handle').fill(handle);
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('suspend-me-please');
	await page.getByRole('button', { name: 'Create account' }).click();
	await page.goto(linkIn(await waitForMail(email, /Confirm your e-mail/), '/api/auth/verify-email'));
	await expectSignedIn(page);

	const mod = await (await browser.newContext()).newPage();
	await signIn(mod, 'tomas@starground.test', DEMO_PASSWORD);
	await mod.goto(`/admin/members?q=${handle}`);
	const row = mod.locator(`tr[data-member="${handle}"]`);
	await row.getByLabel(/Reason to suspend/).fill('Spam links in comments');
	await row.getByRole('button', { name: 'Suspend' }).click();
	await expect(row.getByText('suspended', { exact: true })).toBeVisible();

	// Their live session has ended…
	await page.reload();
	await expect(page.getByRole('link', { name: 'Sign in' })).toBeVisible();
	// …and signing in is refused with a clear sentence.
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('suspend-me-please');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByText('This account is suspended.')).toBeVisible();

	await row.getByRole('button', { name: 'Restore' }).click();
	await expect(row.getByRole('button', { name: 'Suspend' })).toBeVisible();
	await signIn(page, email, 'suspend-me-please');
	await ctx.close();
});
