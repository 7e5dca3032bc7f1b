// A reader in Chromium: finds builds by their numbers (rails and load, then a part they use) on the browse page.
// Expectations come from the builds API with the same figures (the page and the API share one query), plus the
// demo scenario's ±28 V / 8 Ω chip amplifier, so the test holds whatever other tests publish meanwhile.
import { test, expect, type Page } from '@playwright/test';
import sharp from 'sharp';
import { signIn } from './helpers/auth';

async function slugsFromApi(page: Page, qs: string): Promise<string[]> {
	const res = await page.request.get(`/api/v1/builds?${qs}&limit=100`);
	expect(res.status()).toBe(200);
	return ((await res.json()).items as { slug: string }[]).map((i) => i.slug);
}

async function slugsOnPage(page: Page): Promise<string[]> {
	const hrefs = await page.locator('main a[href^="/builds/"]').evaluateAll((as) => as.map((a) => a.getAttribute('href') ?? ''));
	return [...new Set(hrefs.map((h) => h.split('/')[2]).filter((s) => s && s !== 'new'))];
}

test('a reader filters builds by rails and load, then finds builds using a part', async ({ page }) => {
	await page.goto('/builds');
	await expect(page.locator('[data-list-filters]')).toHaveAttribute('data-ready', 'true');
	await page.locator('[data-find-numbers] summary').click();
	await page.getByLabel('Rails from (± V)').fill('25');
	await page.getByLabel('Rails up to (± V)').fill('30');
	await page.getByLabel('Load (Ω)').fill('8');
	await page.getByRole('button', { name: 'Apply' }).click();
	await expect(page).toHaveURL(/railMinV=25.*railMaxV=30.*loadOhm=8/);
	await expect(page.getByRole('list', { name: 'Filters in force' })).toContainText('Rails ±25–30 V');
	await expect(page.getByRole('list', { name: 'Filters in force' })).toContainText('Into 8 Ω');

	const expected = await slugsFromApi(page, 'railMinV=25&railMaxV=30&loadOhm=8');
	// The demo's two-channel chip amplifier states ±28 V rails into 8 Ω; its ±15 V / 32 Ω headphone amp does not match.
	expect(expected).toContain('stereo-power-ic-amp-28v-rails');
	expect(expected).not.toContain('quiet-class-a-headphone-amp');
	const shown = await slugsOnPage(page);
	expect(shown.sort()).toEqual(expected.slice(0, 24).sort());
	// The numbers section stays open with the values in force.
	await expect(page.getByLabel('Rails from (± V)')).toHaveValue('25');

	// Builds using a 4.7 kΩ resistor, asked for as "4.7k": the demo lists theirs as "4k7".
	await page.goto('/builds');
	await page.locator('[data-find-numbers] summary').click();
	await page.getByLabel('Uses a part').selectOption('resistor');
	await page.getByLabel('Value').fill('4.7k');
	await page.getByRole('button', { name: 'Apply' }).click();
	await expect(page.getByRole('list', { name: 'Filters in force' })).toContainText('Uses a resistor 4.7k');
	const using = await slugsFromApi(page, 'partKind=resistor&partValue=4k7');
	expect(using).toContain('dual-rail-linear-supply');
	expect(using).not.toContain('passive-preamp-with-input-selector');
	expect((await slugsOnPage(page)).sort()).toEqual(using.slice(0, 24).sort());

	// A figure that cannot be read is left out with a sentence, the rest still applies.
	await page.goto('/builds?railMinV=forty&loadOhm=8');
	await expect(page.getByText('Some of the link’s filters could not be used')).toBeVisible();
	await expect(page.getByText('must be a number of volts (V), e.g. 30')).toBeVisible();
});

test('a reader compares two builds side by side from a build page', async ({ page }) => {
	await page.goto('/builds/stereo-power-ic-amp-28v-rails');
	await page.locator('[data-compare-link]').click();
	await expect(page.getByRole('heading', { name: 'Compare with another build' })).toBeVisible();
	await page.getByLabel('The other build').fill('/builds/quiet-class-a-headphone-amp');
	await page.getByRole('button', { name: 'Compare' }).click();
	await expect(page).toHaveURL(/\/builds\/stereo-power-ic-amp-28v-rails\/compare\?with=quiet-class-a-headphone-amp$/);
	await expect(page.getByRole('heading', { name: 'Two builds side by side' })).toBeVisible();
	// Both amplifier blocks in one table: the rails differ (±28 V against ±15 V in the demo).
	const amp = page.locator('[data-spec-pair="amplifier"]');
	await expect(amp).toBeVisible();
	const rail = amp.locator('tr', { has: page.getByRole('rowheader', { name: /^Rail\s*(differs)?$/ }) });
	await expect(rail).toHaveAttribute('data-differs', 'true');
	await expect(rail).toContainText('28 V');
	await expect(rail).toContainText('15 V');
	// Parts lists matched by designators: the first build's 4k7 bleeders (R9, R10) are not in the other.
	await expect(page.getByRole('heading', { name: 'Parts lists, matched by designators' })).toBeVisible();
	await expect(page.locator('[data-compare]').first()).toBeVisible();
	// A draft someone else owns is absent to a reader.
	const res = await page.goto('/builds/stereo-power-ic-amp-28v-rails/compare?with=no-such-build-here');
	expect(res?.status()).toBe(404);
});

test('a member records "I built this too" with measurements and a photo; the build shows the figures', async ({ page }) => {
	await signIn(page, 'oskar@starground.test');
	await page.goto('/builds/stereo-power-ic-amp-28v-rails');
	await page.locator('[data-built-it-link]').click();
	await expect(page.getByRole('heading', { name: 'I built this too' })).toBeVisible();
	await page.getByLabel('Rails expected (V)').fill('28, -28');
	await page.getByLabel('Rails measured (V)').fill('27.5');
	await page.getByRole('button', { name: /Record that I built it|Save my figures/ }).click();
	// One measured rail for two expected: refused with a sentence, what was typed is kept.
	await expect(page.getByText('give one measured value for each expected rail (2 expected, 1 measured)')).toBeVisible();
	await expect(page.getByLabel('Rails expected (V)')).toHaveValue('28, -28');
	await page.getByLabel('Rails measured (V)').fill('27.6, -27.9');
	await page.getByLabel('First power-up through a current limiter').check();
	await page.getByLabel('Output DC offset per channel').fill('9, -14');
	await page.getByLabel('Distortion points').fill('1@0.02, 25@0.1, 36@1, 38@10');
	await page.getByLabel('Into (Ω)').fill('8');
	await page.getByRole('button', { name: /Record that I built it|Save my figures/ }).click();
	await expect(page).toHaveURL(/\/builds\/stereo-power-ic-amp-28v-rails#built-it$/);
	const row = page.locator('[data-built-it-row]', { hasText: 'Oskar Lindqvist' });
	await expect(row).toContainText('+27.6 / -27.9 V');
	await expect(row).toContainText('14 mV');
	// Power at 1 % THD: the highest point at or below 1 % (36 W), not the 10 % point.
	await expect(row).toContainText('36 W into 8 Ω');
	await expect(page.locator('[data-built-it-plot="power"] svg')).toBeVisible();
	await expect(page.locator('[data-built-it-plot="offset"] svg')).toBeVisible();

	// A photo of the copy.
	await page.goto('/builds/stereo-power-ic-amp-28v-rails/built-it');
	const png = await sharp({ create: { width: 320, height: 200, channels: 3, background: '#5b6b4e' } }).png().toBuffer();
	await page.locator('#bi-file').setInputFiles({ name: 'copy.png', mimeType: 'image/png', buffer: png });
	await page.getByLabel('What it shows').fill('My copy on the bench');
	await page.getByRole('button', { name: /Add photo|Replace photo/ }).click();
	await expect(page).toHaveURL(/#built-it$/);
	await expect(row.getByRole('img', { name: 'My copy on the bench' })).toBeVisible();
});

test('a member keeps notes on the bench and gets one shopping list for two builds as CSV', async ({ page }) => {
	await signIn(page, 'oskar@starground.test');
	for (const slug of ['stereo-power-ic-amp-28v-rails', 'quiet-class-a-headphone-amp']) {
		await page.request.post('/bench?/toggle', { form: { slug, save: '1' }, headers: { origin: new URL(page.url()).origin } });
	}
	await page.goto('/bench');
	const card = page.locator('li', { has: page.locator('input[name="b"][value="stereo-power-ic-amp-28v-rails"]') });
	await card.getByLabel(/Your note on/).fill('Order 2 W bleeders; check the heatsink tapping.');
	await card.getByRole('button', { name: 'Save note' }).click();
	await expect(card.getByRole('status')).toHaveText('Saved.');
	await page.reload();
	await expect(page.locator('li', { has: page.locator('input[name="b"][value="stereo-power-ic-amp-28v-rails"]') }).getByLabel(/Your note on/)).toHaveValue(
		'Order 2 W bleeders; check the heatsink tapping.'
	);
	await page.locator('input[name="b"][value="stereo-power-ic-amp-28v-rails"]').check();
	await page.locator('input[name="b"][value="quiet-class-a-headphone-amp"]').check();
	await page.getByRole('button', { name: 'Combined shopping list' }).click();
	await expect(page.getByRole('heading', { name: 'Combined shopping list' })).toBeVisible();
	await expect(page.locator('[data-shopping-row]').first()).toBeVisible();
	const csvHref = await page.locator('[data-shopping-csv]').getAttribute('href');
	const res = await page.request.get(csvHref!);
	expect(res.headers()['content-type']).toContain('text/csv');
	const text = await res.text();
	expect(text.split('\r\n')[0]).toBe('kind,value,value_si,unit,rating_v,rating_w,quantity,packages,used_in');
	// Every row names the builds it is for.
	expect(text).toContain('Stereo power-IC amp on ±28 V rails: ');
});

test('a reader opens the bench sheet of a build and downloads it as a PDF', async ({ page }) => {
	await page.goto('/builds/stereo-power-ic-amp-28v-rails');
	await page.locator('[data-sheet-link]').click();
	await expect(page.locator('[data-bench-sheet]')).toBeVisible();
	await expect(page.getByRole('heading', { name: 'Bring-up: write in what you measure' })).toBeVisible();
	// The demo chip amp's bring-up block expects ±28 V rails.
	await expect(page.locator('[data-sheet-boxes]')).toContainText('+28 V');
	await expect(page.locator('[data-sheet-boxes]')).toContainText('DC offset, channel 2 (no speaker)');
	await expect(page.getByRole('heading', { name: 'Parts, grouped for kitting' })).toBeVisible();
	// Printing drops the site's header; the sheet stays.
	await page.emulateMedia({ media: 'print' });
	await expect(page.locator('body header').first()).toBeHidden();
	await expect(page.locator('[data-bench-sheet] h1')).toBeVisible();
	await page.emulateMedia({ media: 'screen' });
	const [download] = await Promise.all([page.waitForEvent('download'), page.locator('[data-sheet-pdf]').click()]);
	expect(download.suggestedFilename()).toBe('stereo-power-ic-amp-28v-rails-bench-sheet.pdf');
	const path = await download.path();
	const { readFile } = await import('node:fs/promises');
	const bytes = await readFile(path);
	expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
	expect(bytes.length).toBeGreaterThan(5000);
});
