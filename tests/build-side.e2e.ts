// The build side of the maker's workshop in Chromium: the build status (set in the editor, shown on the
// build page and its card, filtered on the browse page).
import { test, expect } from '@playwright/test';
import { signIn } from './helpers/auth';
import { createPublishedBuild } from './helpers/builds';

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
