import { test, expect, type Page, type BrowserContext } from '@playwright/test';
import { signIn } from './helpers/auth';

const JOSS = 'joss@starground.test';
const AIKO = 'aiko@starground.test';

const tag = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 5)}`;
// The title itself carries an XSS vector: it must show as text and never run.
const TITLE = `Valve line stage <img src=x onerror=alert('title')> ${tag}`;
const XSS_STEP = [
	'Route mains away from the signal wiring.',
	'',
	"<script>alert('script')</script>",
	'<img src=x onerror="alert(\'img\')">',
	"[click me](javascript:alert('link'))",
	"<svg onload=\"alert('svg')\"><circle r=\"3\"/></svg>",
	"<iframe srcdoc=\"<script>alert('frame')</script>\"></iframe>",
	'![pixel](data:image/svg+xml;base64,PHN2ZyBvbmxvYWQ9YWxlcnQoMSk+)'
].join('\n\n');

/** Count every alert/confirm/prompt a page opens; none may ever fire. */
function watchDialogs(page: Page, fired: string[]) {
	page.on('dialog', async (d) => {
		fired.push(`${d.type()}: ${d.message()}`);
		await d.dismiss();
	});
}

/** Titles of the steps in the editor, in order. */
async function editorStepTitles(page: Page): Promise<string[]> {
	return page.locator('[data-step-editor] input[name="title"]').evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value));
}

test.describe.serial('build journal', () => {
	let slug = '';
	const dialogs: string[] = [];
	let aiko: BrowserContext | null = null;

	test.afterAll(async () => {
		await aiko?.close();
	});

	test('a maker creates a build, adds two steps, reorders them with the keyboard and publishes', async ({ page }) => {
		watchDialogs(page, dialogs);
		await signIn(page, JOSS);
		await page.goto('/builds/new');

		// Bad input is refused with a field error and keeps what was typed.
		await page.getByLabel('Title').fill('ab');
		await page.getByLabel('Summary').fill('A two-valve line stage with a choke-input supply.');
		await page.getByRole('button', { name: 'Create draft' }).click();
		await expect(page.getByText('Use at least 3 characters.')).toBeVisible();
		await expect(page.getByLabel('Summary')).toHaveValue('A two-valve line stage with a choke-input supply.');

		await page.getByLabel('Title').fill(TITLE);
		await expect(page.getByLabel('Title')).toHaveValue(TITLE);
		await page.getByLabel('Category').selectOption('preamp');
		await page.getByLabel('Topology').selectOption('valve');
		await page.getByLabel(/Mains powered/).check();
		await page.getByRole('button', { name: 'Create draft' }).click();
		await expect(page).toHaveURL(/\/builds\/valve-line-stage-img-src-x-onerror-alert-title-[a-z0-9-]+\/edit/);
		slug = new URL(page.url()).pathname.split('/')[2];
		await expect(page.getByRole('heading', { name: 'Edit build' })).toBeVisible();

		// Two steps.
		const add = page.locator('form[action="?/addStep"]');
		await add.getByLabel('Title').fill('Populate the board');
		await add.getByLabel('Text (Markdown)').fill('Fit the **valve bases** first, then the resistors.');
		await add.getByRole('button', { name: 'Add step' }).click();
		await expect(page.locator('[data-step-editor]')).toHaveCount(1);
		await expect(add.getByLabel('Title')).toHaveValue('');

		await add.getByLabel('Title').fill('Wire the chassis');
		await add.getByLabel('Text (Markdown)').fill(XSS_STEP);
		await add.getByRole('button', { name: 'Add step' }).click();
		await expect(page.locator('[data-step-editor]')).toHaveCount(2);
		expect(await editorStepTitles(page)).toEqual(['Populate the board', 'Wire the chassis']);

		// Reorder with the keyboard only: focus "move step 2 up" and press Enter.
		const up = page.getByRole('button', { name: 'Move step 2, Wire the chassis, up' });
		await up.focus();
		await page.keyboard.press('Enter');
		await expect.poll(() => editorStepTitles(page)).toEqual(['Wire the chassis', 'Populate the board']);
		// Focus stays with the moved step (its up button is now disabled, so on its down button).
		await expect(page.getByRole('button', { name: 'Move step 1, Wire the chassis, down' })).toBeFocused();
		// And back down with the keyboard.
		await page.keyboard.press('Enter');
		await expect.poll(() => editorStepTitles(page)).toEqual(['Populate the board', 'Wire the chassis']);
		await page.getByRole('button', { name: 'Move step 2, Wire the chassis, up' }).focus();
		await page.keyboard.press('Enter');
		await expect.poll(() => editorStepTitles(page)).toEqual(['Wire the chassis', 'Populate the board']);

		// Still a draft: a signed-out reader gets 404.
		const anon = await page.context().browser()!.newContext();
		const res = await (await anon.newPage()).goto(`/builds/${slug}`);
		expect(res?.status()).toBe(404);
		await anon.close();

		// Publishing asks first, with room for a note on Rev A.
		await page.locator('[data-publish-confirm] summary').click();
		await page.getByLabel('Note for the revision (optional)').fill('First build, both channels working.');
		await page.getByRole('button', { name: 'Yes, publish now' }).click();
		await expect(page).toHaveURL(new RegExp(`/builds/${slug}\\?published=1$`), { timeout: 30_000 });
		await expect(page.getByText('Published as Rev A: everyone can read it now.')).toBeVisible();
		await expect(page.locator('[data-status="published"]')).toBeVisible();
		await expect(page.getByRole('link', { name: 'Rev A', exact: true })).toBeVisible();
		expect(dialogs).toEqual([]);
	});

	test('a signed-out reader sees it, and nothing in it runs', async ({ browser }) => {
		const context = await browser.newContext();
		const page = await context.newPage();
		watchDialogs(page, dialogs);
		const res = await page.goto(`/builds/${slug}`);
		expect(res?.status()).toBe(200);

		await expect(page.getByRole('heading', { level: 1 })).toHaveText(TITLE);
		await expect(page.locator('[data-step] h3')).toHaveText([/Step 1\s+Wire the chassis/, /Step 2\s+Populate the board/]);
		await expect(page.getByText('Route mains away from the signal wiring.')).toBeVisible();
		await expect(page.locator('[data-mains-caution]')).toBeVisible();
		await expect(page.locator('#review-state')).toBeVisible();
		await expect(page.locator('meta[property="og:title"]')).toHaveAttribute('content', TITLE);

		// The sanitized step: no script, handlers, svg or iframe; the javascript: link has no href.
		const article = page.locator('[data-step] .prose');
		await expect(article).toHaveCount(2);
		expect(await article.locator('script, iframe, svg, math, img, [onerror], [onload], [style]').count()).toBe(0);
		const link = article.locator('a', { hasText: 'click me' });
		await expect(link).toBeVisible();
		expect(await link.getAttribute('href')).toBeNull();
		await link.click();
		await page.waitForTimeout(300);
		expect(await page.evaluate(() => (window as unknown as { __xss?: boolean }).__xss)).toBeUndefined();

		// Readers cannot edit or start their own build from it without signing in.
		await expect(page.getByRole('link', { name: 'Edit build' })).toHaveCount(0);
		await expect(page.getByRole('link', { name: /Sign in to start your own build/ })).toBeVisible();
		const edit = await page.goto(`/builds/${slug}/edit`);
		expect(new URL(edit!.url()).pathname).toBe('/sign-in');

		// The API serves the same build.
		const api = await page.request.get(`/api/v1/builds/${slug}`);
		expect(api.status()).toBe(200);
		const body = await api.json();
		expect(body).toMatchObject({ slug, title: TITLE, status: 'published', revision: 1, review: { label: 'unreviewed', verdict: null, currentRevision: 1 }, mainsPowered: true });
		expect(body.steps.map((s: { title: string }) => s.title)).toEqual(['Wire the chassis', 'Populate the board']);
		expect(body.steps[0].bodyHtml).toContain('click me</a>');
		expect(body.steps[0].bodyHtml).not.toMatch(/<script|\son\w+=|href="\s*javascript:|src="\s*data:|<svg|<iframe|<img/i);
		const list = await (await page.request.get('/api/v1/builds?limit=100')).json();
		expect(list.items.map((i: { slug: string }) => i.slug)).toContain(slug);

		await context.close();
		expect(dialogs).toEqual([]);
	});

	test('another member cannot change it (403) and starts their own build from it instead', async ({ browser }) => {
		aiko = await browser.newContext();
		const page = await aiko.newPage();
		watchDialogs(page, dialogs);
		await signIn(page, AIKO);

		// Every mutating action on someone else's build is refused on the server.
		const originHeader = new URL(page.url()).origin;
		const post = (path: string, form: Record<string, string>) =>
			page.request.post(path, { form, headers: { origin: originHeader, accept: 'text/html' }, maxRedirects: 0 });
		const editRes = await page.goto(`/builds/${slug}/edit`);
		expect(editRes?.status()).toBe(403);
		expect((await post(`/builds/${slug}/edit?/addStep`, { title: 'Hijack', bodyMd: '' })).status()).toBe(403);
		expect((await post(`/builds/${slug}/edit?/update`, { title: 'Hijacked', category: 'dac', topology: 'other', licence: 'CC0-1.0' })).status()).toBe(403);
		expect((await post(`/builds/${slug}?/archive`, {})).status()).toBe(403);

		await page.goto(`/builds/${slug}`);
		await page.getByRole('button', { name: 'Start from this parts list' }).click();
		await expect(page).toHaveURL(/\/edit\?started=1$/);
		await expect(page.getByText('Your draft is ready, based on the original')).toBeVisible();
		const derivedSlug = new URL(page.url()).pathname.split('/')[2];
		expect(derivedSlug).not.toBe(slug);

		await page.getByRole('link', { name: 'Preview build' }).click();
		await expect(page).toHaveURL(new RegExp(`/builds/${derivedSlug}$`));
		const from = page.locator('[data-derived-from]');
		await expect(from).toContainText('Based on');
		await expect(from.getByRole('link')).toHaveText(TITLE);
		// No steps were copied: the new build starts with its maker's own words.
		await expect(page.locator('[data-step]')).toHaveCount(0);

		// The original lists the builds based on it (a draft, so only to its maker).
		await page.goto(`/builds/${slug}`);
		await expect(page.locator('[data-derived-builds]')).toContainText(`${TITLE.slice(0, 20)}`);
		expect(dialogs).toEqual([]);
	});
});
