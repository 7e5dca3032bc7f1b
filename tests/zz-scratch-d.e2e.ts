import { test, expect } from '@playwright/test';
import { signIn } from './helpers/auth';
import { createPublishedBuild } from './helpers/builds';
test('scratch', async ({ page }) => {
	await signIn(page, 'joss@starground.test');
	const b = await createPublishedBuild(page);
	console.log(b.slug);
	await page.goto(`/builds/${b.slug}`);
	await page.screenshot({ path: '/tmp/shots-d/build-page.png', fullPage: true });
	expect(1).toBe(1);
});
