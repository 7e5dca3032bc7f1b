// Typing before a page's script has run: on a slow connection a member can start typing into a server-rendered
// form before the page hydrates. Hydration must keep that text (Svelte re-applies a plain `value` or textarea
// content when it hydrates, which emptied the box — seen as a lost review note in a loaded test run). Here the
// page's JavaScript is held back until the typing is done, then released; the typed text must survive. (The
// navigation waits only for the answer to start: DOMContentLoaded itself waits for the held module scripts.)
import { test, expect, type Page } from '@playwright/test';
import { signedInPage } from './helpers/auth';
import { createPublishedBuild } from './helpers/builds';

/** Holds every script of the app until `release()` is called (the HTML and CSS arrive at once). */
async function holdScripts(page: Page): Promise<() => void> {
	let release!: () => void;
	const gate = new Promise<void>((r) => (release = r));
	await page.route('**/_app/immutable/**/*.js', async (route) => {
		await gate;
		await route.continue();
	});
	return release;
}

/** SvelteKit's client has started (its router keeps its history index in history.state). */
async function hydrated(page: Page): Promise<void> {
	await page.waitForFunction(() => !!history.state && 'sveltekit:history' in history.state, undefined, { timeout: 30_000 });
	await page.waitForLoadState('networkidle');
}

test('browse: the header search and a filter keep what was typed before the page hydrated', async ({ page }) => {
	const release = await holdScripts(page);
	await page.goto('/builds', { waitUntil: 'commit' });
	await page.locator('#q-top').fill('soft start');
	await page.getByText('By the numbers: rails, load, power, a part it uses').click();
	await page.locator('#f-rail-min').fill('25');
	release();
	await hydrated(page);
	await expect(page.locator('#q-top')).toHaveValue('soft start');
	await expect(page.locator('#f-rail-min')).toHaveValue('25');
});

test('asking for review: the note typed before the page hydrated is kept and reaches the review desk', async ({ browser }) => {
	const joss = await signedInPage(browser, 'joss@starground.test');
	const build = await createPublishedBuild(joss);
	const release = await holdScripts(joss);
	await joss.goto(`/builds/${build.slug}/request-review`, { waitUntil: 'commit' });
	await joss.getByLabel('Note for the reviewer (optional)').fill('Typed before the script ran.');
	release();
	await hydrated(joss);
	await expect(joss.getByLabel('Note for the reviewer (optional)')).toHaveValue('Typed before the script ran.');
	await joss.getByRole('button', { name: /on the review desk/ }).click();
	await expect(joss.locator('[data-outcome]')).toHaveText(/Review asked/);
	await joss.goto(`/builds/${build.slug}/request-review`);
	await expect(joss.getByLabel('Note for the reviewer (optional)')).toHaveValue('Typed before the script ran.');
});
