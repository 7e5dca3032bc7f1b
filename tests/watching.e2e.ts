// Watching a build end to end in Chromium: an anonymous reader sees only a sign-in prompt (the cached reader page
// never carries a member's state); a member clicks "Watch" (a plain form, works without JavaScript), the maker
// comments, and the watcher's mail arrives in the fake SMTP's viewer with the one-click unsubscribe headers
// (RFC 8058); "Stop watching" turns it off.
import { test, expect } from '@playwright/test';
import { signedInPage } from './helpers/auth';
import { createPublishedBuild, origin } from './helpers/builds';
import { throwawayMember } from './helpers/members';
import { waitForMail } from './helpers/mail';

test('watch a build → the maker comments → the watcher gets the mail → stop watching', async ({ browser }) => {
	test.setTimeout(120_000);
	const joss = await signedInPage(browser, 'joss@starground.test');
	const build = await createPublishedBuild(joss);
	const buildUrl = `/builds/${build.slug}`;

	// Anonymous: a sign-in prompt, never another member's state.
	const anon = await (await browser.newContext()).newPage();
	await anon.goto(buildUrl);
	await expect(anon.locator('[data-watch-sign-in]')).toHaveText(/Sign in to watch/);
	await expect(anon.locator('[data-watch-button]')).toHaveCount(0);

	// The maker sees no watch button on their own build.
	await joss.goto(buildUrl);
	await expect(joss.locator('[data-watch-button]')).toHaveCount(0);

	// A member watches it, with JavaScript off (a plain form post and redirect).
	const ctx = await browser.newContext({ javaScriptEnabled: false });
	const watcher = await throwawayMember(ctx.request, 'watch');
	const page = await ctx.newPage();
	await page.goto(buildUrl);
	const button = page.locator('[data-watch-button]');
	await expect(button).toHaveText(/Watch/);
	await expect(button).toHaveAttribute('aria-pressed', 'false');
	await button.click();
	await expect(page).toHaveURL(new RegExp(`${buildUrl}\\?done=watching`));
	await expect(page.locator('[data-outcome]')).toContainText('You watch this build now');
	await expect(button).toHaveText(/Stop watching/);
	await expect(button).toHaveAttribute('aria-pressed', 'true');

	// The anonymous page still shows only the prompt (the reader cache keeps no member state).
	await anon.reload();
	await expect(anon.locator('[data-watch-sign-in]')).toBeVisible();

	// The maker comments; the watcher's mail arrives, in our words, with the RFC 8058 headers.
	const res = await joss.request.post(`/api/v1/builds/${build.slug}/comments`, {
		data: { body: 'Rev A is up: the heatsink step now has the insulator photo.' },
		headers: { origin: origin() }
	});
	expect(res.status()).toBe(201);
	const mail = await waitForMail(watcher.email, new RegExp(`New comment on “${build.title}”`));
	expect(mail.text).toContain(`commented on “${build.title}”, a build you watch`);
	expect(mail.text).toContain('Rev A is up');
	expect(mail.rawHeaders['list-unsubscribe-post']).toBe('List-Unsubscribe=One-Click');
	expect(mail.rawHeaders['list-unsubscribe']).toMatch(/^<https?:\/\/[^>]+\/unsubscribe\/one-click\?token=[^>]+>$/);

	// Stop watching.
	await button.click();
	await expect(page.locator('[data-outcome]')).toContainText('You stopped watching this build');
	await expect(button).toHaveText(/^\s*Watch\s*$/);
	await expect(button).toHaveAttribute('aria-pressed', 'false');
});
