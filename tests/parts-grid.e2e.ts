// The costed parts list and the grid editor end to end in Chromium: a costed list imported, shown with one total
// per currency (quantities per channel × the amplifier block's channels), exported, imported back and exported
// again byte for byte; the grid's keyboard (Enter adds a line) and a multi-line paste; a bare 1u+1u asks which is
// meant, with and without JavaScript. Desktop and a 390×844 phone for the round trip.
import { test, expect, type Page } from '@playwright/test';
import { signIn } from './helpers/auth';
import { createPublishedBuild, postForm } from './helpers/builds';
import { COSTED_CSV_HEADER, importCsv } from './helpers/parts';
import { SIZES } from './helpers/sizes';
import { AMP_FORM as AMP_FIELDS } from '../src/lib/specs/fixtures';

const JOSS = 'joss@starground.test';

/** An amplifier block with 2 channels (the spec editor's form fields; nested fields are posted as a__b). */
const AMP_FORM = {
	kind: 'amplifier',
	id: '',
	title: 'Output stage',
	...AMP_FIELDS,
	claimed__powerW: '30',
	claimed__thdPct: '1'
};

/**
 * A costed list: exact sub-cent prices, a supplier with a comma and quotes, per-channel lines, an X capacitor
 * rated in V AC, two currencies and a note with a line break. Hand calculation of the totals (2 channels):
 *   R1  0R22   2 per channel × 2 = 4 × 0.0125 EUR = 0.05 EUR
 *   C1  10000u 2 (not per channel)  × 3.20 EUR   = 6.40 EUR
 *   CX1 100n   1                    × 0.35 EUR   = 0.35 EUR   → EUR 6.80
 *   U1  chip   1 per channel × 2    × 1200 JPY   = 2400 JPY   → JPY 2,400 (never added to the euros)
 *   H1  screws 4, no price → "1 line has no price".
 */
const COSTED = [
	COSTED_CSV_HEADER,
	'"R1, R2",2,resistor,0R22,5,,5,wirewound,"emitter resistors, one pair per channel",,,WW5-0R22,"Bench ""B"", Ltd",0.0125,EUR,yes',
	'C1,2,capacitor,10000u,20,50,,snap-in,reservoir,,,,Any shop,3.20,EUR,',
	'CX1,1,capacitor,100n,,275 V AC,,box,"across the mains\nafter the fuse",,,,,0.35,EUR,',
	'U1,1,ic,5-pin monolithic power amplifier IC,,,,TO-220,,,,,,1200,JPY,yes',
	'H1,4,hardware,M3 screws,,,,,,,,,,,,'
].join('\r\n');

for (const size of SIZES) {
	test.describe(size.name, () => {
		test.use({ viewport: size.viewport });

		test('a costed parts list: totals per currency × channels, and export → import → export gives the same CSV', async ({ page }) => {
			test.setTimeout(150_000);
			await signIn(page, JOSS);
			const { slug } = await createPublishedBuild(page, { supply: false });
			const amp = await postForm(page.request, `/builds/${slug}/edit/specs?/save`, AMP_FORM);
			expect(amp.status(), 'save amplifier block').toBe(303);

			await page.goto(`/builds/${slug}/edit/parts`);
			await expect(page.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
			await importCsv(page, COSTED, 'replace', 5);
			await expect(page.locator('#parts-form tr[data-line]')).toHaveCount(5);
			await expect(page.locator('#l1-unitPrice')).toHaveValue('0.0125');
			await expect(page.locator('#l1-perChannel')).toHaveValue('yes');
			await expect(page.locator('#l3-ratingV')).toHaveValue('275 V AC');

			// The build page: values as typed with the SI reading, per-channel counts, one total per currency.
			await page.goto(`/builds/${slug}`);
			const parts = page.locator('#parts');
			await expect(parts.locator('tbody[data-part-line="R1, R2"]')).toContainText('0R22 · 220 mΩ');
			await expect(parts.locator('tbody[data-part-line="C1"]')).toContainText('10000u · 10.0 mF');
			await expect(parts.locator('tbody[data-part-line="R1, R2"]')).toContainText('per ch. · 4 in all');
			await expect(parts.locator('tbody[data-part-line="CX1"]')).toContainText('275 V AC');
			const cost = parts.locator('[data-parts-cost]');
			await expect(cost.locator('[data-total="EUR"]')).toHaveText('EUR 6.80');
			await expect(cost.locator('[data-total="JPY"]')).toHaveText('JPY 2,400');
			await expect(cost).toContainText('not added together');
			await expect(cost).toContainText('1 line has no price');
			// On a phone the table scrolls inside its frame; the page itself never scrolls sideways.
			const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
			expect(overflow).toBeLessThanOrEqual(0);

			// Export, import that file back (replace), export again: the same bytes.
			const first = await page.request.get(`/api/v1/builds/${slug}/parts.csv`);
			expect(first.status()).toBe(200);
			const csv1 = await first.text();
			expect(csv1.split('\r\n')[0]).toBe(
				'designators,quantity,kind,value,tolerance_pct,rating_v,rating_w,package,notes,design_value,substitution_reason,mpn,supplier,unit_price,currency,per_channel,value_si,unit,deviation_pct'
			);
			expect(csv1).toContain('"Bench ""B"", Ltd",0.0125,EUR,yes');
			await page.goto(`/builds/${slug}/edit/parts`);
			await expect(page.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
			await importCsv(page, csv1, 'replace', 5);
			const second = await page.request.get(`/api/v1/builds/${slug}/parts.csv`);
			expect(await second.text()).toBe(csv1);
		});
	});
}

/** Paste `text` into a field as a spreadsheet would (a paste event carrying text/plain). */
async function paste(page: Page, selector: string, text: string) {
	await page.locator(selector).focus();
	await page.locator(selector).evaluate((el, t) => {
		const dt = new DataTransfer();
		dt.setData('text/plain', t);
		el.dispatchEvent(new ClipboardEvent('paste', { clipboardData: dt, bubbles: true, cancelable: true }));
	}, text);
}

test('the grid: Enter in the last row adds a line, a pasted block adds every row, a bare 1u+1u asks', async ({ page }) => {
	test.setTimeout(120_000);
	await signIn(page, JOSS);
	const { slug } = await createPublishedBuild(page, { supply: false });
	await page.goto(`/builds/${slug}/edit/parts`);
	await expect(page.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
	const rows = page.locator('#parts-form tr[data-line]');

	await page.getByRole('button', { name: 'Add a line' }).click();
	await page.getByLabel('Line 1, designators').fill('R1');
	await page.getByLabel('Line 1, value (fitted)').fill('1k');
	await page.getByLabel('Line 1, value (fitted)').press('Enter');
	await expect(rows).toHaveCount(2);
	await expect(page.locator('#l2-designators')).toBeFocused();

	// Three lines copied from a spreadsheet (tab-separated, columns from designators on) fill the empty row and add two.
	await paste(page, '#l2-designators', 'R5\t1\tresistor\t4k7\nR6\t1\tresistor\t104\nC7\t1\tcapacitor\t1u+1u\n');
	await expect(rows).toHaveCount(4);
	await expect(page.locator('#l3-value')).toHaveValue('104');
	await expect(page.locator('[data-hint-for="3"]')).toContainText('3-digit resistor code (IEC 60062): 10 × 10⁴ Ω = 100 kΩ');

	// The bare "+" between capacitors: a question with the two rewrites and what each gives.
	const ask = page.locator('[data-hint-for="4"] [data-asks]');
	await expect(ask).toContainText('series or parallel?');
	await expect(ask.getByRole('button', { name: /2×1u series/ })).toContainText('two 1.00 µF in series = 500 nF');
	await expect(ask.getByRole('button', { name: /1u\|\|1u/ })).toContainText('two 1.00 µF in parallel = 2.00 µF');

	// Saving as it is: refused on that line, nothing saved, the question stays.
	await page.getByRole('button', { name: 'Save parts list' }).click();
	await expect(page.getByRole('alert').filter({ hasText: 'Nothing was saved' })).toContainText('Line 4, value');
	await ask.getByRole('button', { name: /2×1u series/ }).click();
	await expect(page.locator('#l4-value')).toHaveValue('2×1u series');
	await expect(page.locator('[data-hint-for="4"]')).toContainText('two 1.00 µF in series = 500 nF');
	await page.getByRole('button', { name: 'Save parts list' }).click();
	await expect(page.getByText('Parts list saved: 4 lines')).toBeVisible();
	const saved = page.locator('section[aria-labelledby="saved-h"]');
	await expect(saved.locator('tbody[data-part-line="R6"]')).toContainText('104 · 100 kΩ');
	await expect(saved.locator('tbody[data-part-line="C7"]')).toContainText('2×1u series · 500 nF');
});

test.describe('without JavaScript', () => {
	test.use({ javaScriptEnabled: false });

	test('the grid is a plain form: a bare 1u+1u asks, a choice rewrites it, Save saves', async ({ page }) => {
		test.setTimeout(120_000);
		await signIn(page, JOSS);
		const { slug } = await createPublishedBuild(page, { supply: false });
		await page.goto(`/builds/${slug}/edit/parts`);
		await page.getByRole('button', { name: 'Add a line' }).click();
		await page.getByLabel('Line 1, designators').fill('C3');
		await page.getByLabel('Line 1, kind').selectOption('capacitor');
		await page.getByLabel('Line 1, value (fitted)').fill('1u+1u');
		await page.getByLabel('Line 1, unit price').fill('0.40');
		await page.getByLabel('Line 1, currency (ISO code)').fill('eur');
		await page.getByRole('button', { name: 'Save parts list' }).click();
		await expect(page.getByRole('alert').filter({ hasText: 'Nothing was saved' })).toContainText('Write 2×1u series');
		await page.getByRole('button', { name: /1u\|\|1u/ }).click();
		await expect(page.getByLabel('Line 1, value (fitted)')).toHaveValue('1u||1u');
		await expect(page.getByLabel('Line 1, unit price')).toHaveValue('0.40');
		await page.getByRole('button', { name: 'Save parts list' }).click();
		await expect(page.getByText('Parts list saved: 1 line')).toBeVisible();
		await expect(page.locator('section[aria-labelledby="saved-h"]')).toContainText('1u||1u · 2.00 µF');
		await expect(page.locator('section[aria-labelledby="saved-h"] [data-total="EUR"]')).toHaveText('EUR 0.40');
	});
});
