import { test, expect, type APIRequestContext } from '@playwright/test';
import { signIn } from './helpers/auth';

/** The newest published build (from the API, so the test does not depend on the demo's exact words). */
async function newestBuild(request: APIRequestContext) {
	const res = await request.get('/api/v1/builds?limit=1');
	expect(res.ok()).toBe(true);
	const body = await res.json();
	expect(body.items.length).toBeGreaterThan(0);
	return body.items[0] as { slug: string; title: string; category: string; categoryLabel: string };
}

/**
 * A word worth searching for, taken from a published title (5+ letters) that exactly one build carries and
 * the suggestions find — so the test works on any data set, whatever other tests publish meanwhile.
 */
async function searchWord(request: APIRequestContext): Promise<string> {
	const list = await (await request.get('/api/v1/builds?limit=50')).json();
	for (const item of list.items as { title: string }[]) {
		const words = (item.title.match(/[A-Za-z]{5,}/g) ?? []).sort((a, b) => b.length - a.length);
		for (const w of words) {
			const prefix = w.slice(0, Math.max(4, w.length - 2)).toLowerCase();
			const [hits, sugg] = await Promise.all([
				request.get(`/api/v1/builds?q=${w}&limit=2`).then((r) => r.json()),
				request.get(`/api/v1/search/suggest?q=${prefix}`).then((r) => r.json())
			]);
			// Only a word that a single build carries: other tests publish builds meanwhile (with shared
			// title words), and a tie in rank could reorder the results between two requests.
			if (hits.items.length === 1 && sugg.items.length) return w;
		}
	}
	throw new Error('no published build with a searchable title word');
}

/** What the API ranks first for a search: the page uses the same query, so it must show this build on top. */
async function topHit(request: APIRequestContext, q: string) {
	const res = await request.get(`/api/v1/builds?q=${encodeURIComponent(q)}&limit=1`);
	const body = await res.json();
	expect(body.items.length).toBeGreaterThan(0);
	return body.items[0] as { slug: string; title: string };
}

test('search: typing offers matching titles, submitting shows ranked results with the hit highlighted', async ({ page, request }) => {
	const word = await searchWord(request);
	const prefix = word.slice(0, Math.max(4, word.length - 2)).toLowerCase();
	const suggested = await (await request.get(`/api/v1/search/suggest?q=${prefix}`)).json();
	expect(suggested.items.length).toBeGreaterThan(0);
	const top = await topHit(request, word);

	await page.goto('/search');
	const box = page.getByRole('combobox', { name: 'Search builds' });
	await expect(box).toHaveAttribute('data-ready', 'true');
	await box.pressSequentially(prefix, { delay: 30 });
	// Suggestions come from /api/v1/search/suggest while typing.
	const listbox = page.getByRole('listbox', { name: 'Matching titles' });
	await expect(listbox.getByRole('option').first()).toHaveText(suggested.items[0].title);
	await expect(box).toHaveAttribute('aria-expanded', 'true');
	await box.press('Escape');
	await expect(listbox).toBeHidden();
	await expect(box).toHaveValue(prefix);
	await box.fill(word);
	await box.press('Enter');
	await expect(page).toHaveURL(new RegExp(`/search\\?q=${word}`));
	const card = page.locator('[data-build-card]').first();
	await expect(card).toHaveAttribute('data-build-card', top.slug);
	const marks = card.locator('mark');
	await expect(marks.first()).toBeVisible();
	expect((await marks.allTextContents()).map((t) => t.toLowerCase())).toContain(word.toLowerCase());
	// Highlighting adds <mark> only: no other markup arrives inside the title.
	expect(await card.locator('h3 a *:not(mark)').count()).toBe(0);
});

test('search works without JavaScript as a plain GET form', async ({ browser, request }) => {
	const word = await searchWord(request);
	const context = await browser.newContext({ javaScriptEnabled: false });
	const page = await context.newPage();
	await page.goto('/search');
	await page.getByRole('combobox', { name: 'Search builds' }).fill(word);
	await page.getByRole('button', { name: 'Search', exact: true }).click();
	await expect(page).toHaveURL(new RegExp(`q=${word}`));
	const top = await topHit(request, word);
	await expect(page.locator('[data-build-card]').first()).toHaveAttribute('data-build-card', top.slug);
	await expect(page.locator(`[data-build-card="${top.slug}"] mark`).first()).toHaveText(new RegExp(word, 'i'));
	await context.close();
});

test('browse: choosing a category filters the list and the URL carries it', async ({ page, request }) => {
	const build = await newestBuild(request);
	await page.goto('/builds');
	await expect(page.locator('[data-list-filters]')).toHaveAttribute('data-ready', 'true');
	await page.getByLabel('Category').selectOption(build.category);
	// With JavaScript the change applies at once; the filter lands in the URL so the link can be shared.
	await expect(page).toHaveURL(new RegExp(`[?&]category=${build.category}(&|$)`));
	const cards = page.locator('[data-build-card]');
	await expect(cards.first()).toBeVisible();
	const labels = await cards.locator('p.uppercase').allTextContents();
	expect(labels.length).toBeGreaterThan(0);
	for (const l of labels) expect(l).toContain(build.categoryLabel);
	await expect(page.locator(`[data-build-card="${build.slug}"]`)).toBeVisible();
	await expect(page.getByRole('list', { name: 'Filters in force' })).toContainText(build.categoryLabel);

	// The shared link opens the same list; "Clear all" goes back to every build.
	const shared = page.url();
	const other = await page.context().newPage();
	await other.goto(shared);
	await expect(other.getByLabel('Category')).toHaveValue(build.category);
	await other.getByRole('link', { name: 'Clear all' }).click();
	await expect(other).toHaveURL(/\/builds$/);
	await other.close();
});

test('browse filters work without JavaScript too (Apply button)', async ({ browser, request }) => {
	const build = await newestBuild(request);
	const context = await browser.newContext({ javaScriptEnabled: false });
	const page = await context.newPage();
	await page.goto('/builds');
	await page.getByLabel('Category').selectOption(build.category);
	await page.getByRole('button', { name: 'Apply' }).click();
	await expect(page).toHaveURL(new RegExp(`category=${build.category}`));
	await expect(page.locator(`[data-build-card="${build.slug}"]`)).toBeVisible();
	await context.close();
});

test('bench: a saved build shows on /bench and can be taken off again', async ({ page }) => {
	await signIn(page, 'aiko@starground.test');
	const build = await newestBuild(page.request);
	const saved = await page.request.post(`/api/v1/bench/${build.slug}`);
	expect(saved.status()).toBe(200);
	expect(await saved.json()).toEqual({ slug: build.slug, saved: true });
	await page.goto('/bench');
	const card = page.locator(`[data-build-card="${build.slug}"]`);
	await expect(card.locator('[data-bench-button]')).toHaveAttribute('data-ready', 'true');
	const answered = page.waitForResponse((r) => r.url().includes('/bench?/toggle') && r.request().method() === 'POST');
	await card.getByRole('button', { name: 'Remove' }).click();
	expect((await answered).status()).toBe(200);
	await expect(card.getByRole('button', { name: 'Save to bench' })).toBeEnabled();
	await page.reload();
	await expect(page.locator(`[data-build-card="${build.slug}"]`)).toHaveCount(0);
	// Signed out, the bench API answers the envelope.
	const anon = await page.context().browser()!.newContext();
	const r = await anon.request.post(`${new URL(page.url()).origin}/api/v1/bench/${build.slug}`);
	expect(r.status()).toBe(401);
	expect((await r.json()).error.code).toBe('unauthenticated');
	await anon.close();
});
