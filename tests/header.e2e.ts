// The site header at desktop width and on a 390×844 phone: search stays at every width; a signed-in member has a
// menu (their initials or picture) instead of a bare "Sign out", with the places their role opens; it works with the
// keyboard and without JavaScript.
import { test, expect } from '@playwright/test';
import { expectSignedIn, memberMenu, openMemberMenu, signIn, signOut } from './helpers/auth';
import { SIZES } from './helpers/sizes';

const MAKER_LINKS = ['New build', 'My builds', 'My bench', 'Account'];

for (const size of SIZES) {
	test.describe(size.name, () => {
		test.use({ viewport: size.viewport });

		test(`search and the member menu, its links by role, keyboard (${size.name})`, async ({ page, browser }) => {
			test.setTimeout(90_000);
			await page.goto('/');
			const header = page.locator('[data-site-header]');
			await expect(header.getByRole('searchbox', { name: 'Search builds' })).toBeVisible();
			await expect(header.getByRole('link', { name: 'Sign in' })).toBeVisible();
			await expect(memberMenu(page)).toHaveCount(0);

			// The search field works from the header at this width.
			await header.getByRole('searchbox', { name: 'Search builds' }).fill('amplifier');
			await header.getByRole('searchbox', { name: 'Search builds' }).press('Enter');
			await expect(page).toHaveURL(/\/search\?q=amplifier$/);

			// A maker: the menu holds their places and Sign out, nothing of the desks.
			await signIn(page, 'joss@starground.test');
			await expectSignedIn(page, 'Joss');
			await expect(header.getByRole('button', { name: 'Sign out' })).toBeHidden();
			const items = await openMemberMenu(page);
			await expect(items.getByRole('link')).toHaveText(MAKER_LINKS);
			await expect(items.getByRole('button', { name: 'Sign out' })).toBeVisible();

			// Keyboard: Escape closes it and gives the focus back to its summary; Enter opens it; Tab reaches the links.
			await page.keyboard.press('Escape');
			await expect(items).toBeHidden();
			const summary = memberMenu(page).locator('summary');
			await expect(summary).toBeFocused();
			await page.keyboard.press('Enter');
			await expect(items).toBeVisible();
			await page.keyboard.press('Tab');
			await expect(items.getByRole('link', { name: 'New build' })).toBeFocused();
			await page.keyboard.press('Tab');
			await page.keyboard.press('Enter');
			await expect(page).toHaveURL(/\/my-builds$/);
			// Following a link closes the menu.
			await expect(items).toBeHidden();

			// A moderator sees the desks their role opens.
			const mod = await browser.newContext({ viewport: size.viewport });
			const tomas = await mod.newPage();
			await signIn(tomas, 'tomas@starground.test');
			await expect((await openMemberMenu(tomas)).getByRole('link')).toHaveText([...MAKER_LINKS, 'Review desk', 'Moderation desk', 'Members']);
			await mod.close();

			await signOut(page);
			await expect(memberMenu(page)).toHaveCount(0);
		});
	});
}

test.describe('without JavaScript, on a phone', () => {
	test.use({ javaScriptEnabled: false, viewport: SIZES[1].viewport });

	test('the member menu opens and Sign out signs out', async ({ page }) => {
		await signIn(page, 'aiko@starground.test');
		const items = await openMemberMenu(page);
		await expect(items.getByRole('link', { name: 'My builds' })).toBeVisible();
		await signOut(page);
		// The main links' menu opens too.
		await page.locator('[data-nav-menu] summary').click();
		await expect(page.locator('[data-nav-menu]').getByRole('link', { name: 'Bench tools' })).toBeVisible();
	});
});

// Home and the build page are rendered on the server and never hydrated (issue 15, README "Speed"): the only
// script they load is the header's few lines for its menus; on a hydrated page (browse) the framework loads.
test('home and the build page load no framework, only the header menus script; the menus still answer Escape', async ({ page }) => {
	const scripts: string[] = [];
	page.on('request', (r) => {
		if (r.resourceType() === 'script') scripts.push(new URL(r.url()).pathname);
	});
	await signIn(page, 'joss@starground.test');
	for (const path of ['/', '/builds/stereo-power-ic-amp-28v-rails']) {
		scripts.length = 0;
		await page.goto(path, { waitUntil: 'networkidle' });
		expect(scripts, path).toHaveLength(1);
		expect(scripts[0], path).toMatch(/header-menus[^/]*\.js$/);
		const items = await openMemberMenu(page);
		await page.keyboard.press('Escape');
		await expect(items, path).toBeHidden();
		await expect(memberMenu(page).locator('summary'), path).toBeFocused();
	}
	scripts.length = 0;
	await page.goto('/builds', { waitUntil: 'networkidle' });
	expect(scripts.filter((s) => s.startsWith('/_app/immutable/entry/')).length).toBeGreaterThan(0);

	// A link from that hydrated page to a build page loads it as a new document: none of its components is fetched.
	scripts.length = 0;
	const card = page.locator('[data-build-card] a[href^="/builds/"]').first();
	const href = await card.getAttribute('href');
	const loaded = page.waitForRequest((r) => r.resourceType() === 'document' && new URL(r.url()).pathname === href);
	await card.click();
	await loaded;
	await page.waitForLoadState('networkidle');
	await expect(page.locator('[data-comments]')).toBeVisible();
	expect(scripts.filter((s) => s.startsWith('/_app/'))).toEqual([expect.stringMatching(/header-menus[^/]*\.js$/)]);
});

test('the current place: "Builds" on browse and on a build page, "New build" (not "Builds") on /builds/new', async ({ page }) => {
	const main = page.getByRole('navigation', { name: 'Main', exact: true });
	await page.goto('/builds');
	await expect(main.getByRole('link', { name: 'Builds', exact: true })).toHaveAttribute('aria-current', 'page');
	await page.goto('/builds/stereo-power-ic-amp-28v-rails');
	await expect(main.getByRole('link', { name: 'Builds', exact: true })).toHaveAttribute('aria-current', 'page');
	await signIn(page, 'aiko@starground.test');
	await page.goto('/builds/new');
	await expect(main.getByRole('link', { name: 'Builds', exact: true })).not.toHaveAttribute('aria-current', 'page');
	const items = await openMemberMenu(page);
	await expect(items.getByRole('link', { name: 'New build' })).toHaveAttribute('aria-current', 'page');
});
