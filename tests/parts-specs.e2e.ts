import { test, expect, type Page } from '@playwright/test';
import { signIn } from './helpers/auth';
import { postForm, SUPPLY_FORM } from './helpers/builds';

const SLUG = 'bench-stereo-chip-amp';
const JOSS = 'joss@starground.test';

async function fillAmplifier(page: Page, title: string, loadOhm: string) {
	await page.getByLabel('Title').fill(title);
	await page.getByLabel('Channels').fill('2');
	await page.getByLabel('Rail voltage').fill('28');
	await page.getByLabel('Nominal load').fill(loadOhm);
	await page.getByLabel('Max total supply').fill('60');
	await page.getByLabel('Dropout per side').fill('3');
	await page.getByLabel('Junction max').fill('150');
	await page.getByLabel('Rth junction–case').fill('1');
	await page.getByLabel('Minimum load').fill('4R');
	await page.getByLabel('Rf (feedback)').fill('22k');
	await page.getByLabel('Ri (to ground)').fill('680R');
	// 60 W is beyond what ±28 V can give into 8 Ω with 3 V dropout (≈ 39 W): a caution.
	await page.getByLabel('Claimed power per channel').fill('60');
	await page.getByLabel('At THD').fill('1');
}

/** Fill the open supply form (160 VA, 20 V per rail, 10 000 µF at 35 V, 1.5 A, T1.6 A fuse) and add the block. */
async function addSupplyBlock(page: Page) {
	await page.getByLabel('Transformer rating').fill('160');
	await page.getByLabel('Secondary per rail').fill('20');
	await page.getByLabel('Reservoir per rail').fill('10000u');
	await page.getByLabel('Reservoir voltage rating').fill('35');
	await page.getByLabel('Load current per rail').fill('1.5');
	await page.getByLabel('Fuse rating').fill('1.6');
	await page.getByLabel('Fuse type').selectOption('slow');
	await page.getByRole('button', { name: 'Add block' }).click();
	await expect(page.getByText('Block saved.')).toBeVisible();
}

test('spec blocks: a bad amplifier block is refused field by field, a good one shows derived values and checks; a supply block', async ({ page }) => {
	test.setTimeout(120_000);
	const title = `E2E amplifier ${Date.now().toString(36)}`;
	await signIn(page, JOSS);
	await page.goto(`/builds/${SLUG}/edit/specs`);
	await page.getByRole('link', { name: /Amplifier/ }).first().click();
	await expect(page.getByRole('heading', { name: 'Add an amplifier block' })).toBeVisible();
	await expect(page.locator('form[data-ready="true"]')).toBeVisible();

	// 0R1 is a readable value but below the schema's 0.5 Ω: the server refuses it on that field.
	await fillAmplifier(page, title, '0R1');
	await page.getByRole('button', { name: 'Add block' }).click();
	const load = page.getByLabel('Nominal load');
	await expect(load).toHaveAttribute('aria-invalid', 'true');
	await expect(page.getByText('must be at least 0.5 Ω')).toBeVisible();
	await expect(page.getByText('The block was not saved')).toBeVisible();
	// What was typed is still there.
	await expect(page.getByLabel('Rf (feedback)')).toHaveValue('22k');

	await load.fill('8R');
	await page.getByRole('button', { name: 'Add block' }).click();
	await expect(page.getByText('Block saved.')).toBeVisible();
	const block = page.locator('section[data-spec-block="amplifier"]', { hasText: title });
	await expect(block).toBeVisible();
	await expect(block.locator('[data-derived="maxPowerW"]')).toContainText('39.1 W');
	await expect(block.locator('[data-derived="gainDb"]')).toContainText('dB');
	const badge = block.locator('[data-check="amp.power-beyond-rails"]');
	await expect(badge).toBeVisible();
	await expect(badge).toContainText('CAUTION');
	// The rule id stays out of the visible text (tooltip only); the signal word is a sign, not a colour alone.
	await expect(badge).not.toContainText('amp.power-beyond-rails');
	await expect(badge).toHaveAttribute('title', /amp\.power-beyond-rails/);
	await expect(badge).toContainText('60 W');

	// A supply block: its caution text defers to local codes; 35 V caps on a ~27.6 V rail get a margin caution.
	await page.getByRole('link', { name: /Power supply/ }).first().click();
	await expect(page.locator('form[data-ready="true"]')).toBeVisible();
	await page.getByLabel('Title').fill(`${title} supply`);
	await addSupplyBlock(page);
	const supply = page.locator('section[data-spec-block="supply"]', { hasText: `${title} supply` });
	await expect(supply.locator('[data-derived="peakDcV"]')).toContainText('27.6 V');
	await expect(supply.locator('[data-check="supply.cap-rating"]')).toContainText('CAUTION');
	await expect(supply.getByText(/Defer to local codes and licensed practice/).first()).toBeVisible();
});

test('spec blocks: a save over a block changed in another tab is refused (409) with both versions shown; saving again replaces it', async ({ page, context }) => {
	test.setTimeout(120_000);
	const title = `E2E conflict ${Date.now().toString(36)}`;
	await signIn(page, JOSS);
	await page.goto(`/builds/${SLUG}/edit/specs?add=supply`);
	await expect(page.locator('form[data-ready="true"]')).toBeVisible();
	await page.getByLabel('Title').fill(title);
	await addSupplyBlock(page);
	const id = new URL(page.url()).searchParams.get('saved');
	expect(id).toBeTruthy();

	// Two tabs open the same block; the second saves first.
	const other = await context.newPage();
	await page.goto(`/builds/${SLUG}/edit/specs?edit=${id}`);
	await other.goto(`/builds/${SLUG}/edit/specs?edit=${id}`);
	for (const p of [page, other]) await expect(p.locator('form[data-ready="true"]')).toBeVisible();
	await other.getByLabel('Reservoir voltage rating').fill('50');
	await other.getByRole('button', { name: 'Save changes' }).click();
	await expect(other.getByText('Block saved.')).toBeVisible();

	await page.getByLabel('Load current per rail').fill('2');
	// (The form action answers 409; with JavaScript the page receives it as a failed action result.)
	await page.getByRole('button', { name: 'Save changes' }).click();
	const box = page.locator('[data-spec-conflict]');
	await expect(box).toBeVisible();
	await expect(box).toContainText('Reservoir voltage rating');
	await expect(box).toContainText('50');
	await expect(page.getByText(/changed elsewhere/)).toBeVisible();
	// The maker's values are kept; saving again replaces the stored block on purpose.
	await expect(page.getByLabel('Load current per rail')).toHaveValue('2');
	await page.getByRole('button', { name: 'Save changes' }).click();
	await expect(page.getByText('Block saved.')).toBeVisible();
	const saved = page.locator(`#block-${id}`);
	await expect(saved).toContainText('2 A');
	await other.close();
	// Without JavaScript a stale version gets the HTTP status itself.
	const stale = await postForm(page.request, `/builds/${SLUG}/edit/specs?/save&edit=${id}`, { ...SUPPLY_FORM, id: id!, version: '2000-01-01T00:00:00.000Z' });
	expect(stale.status()).toBe(409);
});

test('parts list: a CSV with one bad line is refused with its line number and nothing is saved; fixed, it saves; export', async ({ page }) => {
	test.setTimeout(120_000);
	await signIn(page, JOSS);
	await page.goto(`/builds/${SLUG}/edit/parts`);
	await expect(page.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
	const saved = page.locator('section[aria-labelledby="saved-h"]');
	const before = await saved.textContent();

	const tag = Date.now().toString(36);
	const good = [
		'designators,quantity,kind,value,tolerance_pct,rating_v,package,notes,design_value,substitution_reason',
		`"R1, R2",2,resistor,4k7,1,,0207,"metal film, e2e ${tag}",,`,
		'C3,1,capacitor,2×1u series,10,63,box film,,0.47u,had two 1 µF film caps on hand',
		'U1,2,ic,5-pin monolithic power amplifier IC,,,TO-220,,,'
	];
	const bad = [...good.slice(0, 3), 'C9,1,capacitor,10 bananas,,25,radial,,,', good[3]];
	await page.getByLabel('…or paste the CSV text').fill(bad.join('\n'));
	await page.getByRole('button', { name: 'Preview' }).click();
	const alert = page.getByRole('alert').filter({ hasText: 'Nothing was saved' });
	await expect(alert).toBeVisible();
	await expect(alert).toContainText('Line 4, value: cannot read the value');
	await expect(page.locator('tr[data-csv-line="4"]')).toContainText('Error');
	await expect(page.getByRole('button', { name: /Save these/ })).toHaveCount(0);
	// Nothing was saved.
	await page.reload();
	await expect(saved).toHaveText(before ?? '');
	await expect(page.locator('#parts-form')).toHaveAttribute('data-ready', 'true');

	// Fix line 4 in the text box and preview again.
	const fixed = [...good.slice(0, 3), 'C9,1,capacitor,100u,,25,radial,,,', good[3]];
	await page.getByLabel('…or paste the CSV text').fill(fixed.join('\n'));
	await page.getByRole('button', { name: 'Preview' }).click();
	await expect(page.getByText('All 4 lines are valid')).toBeVisible();
	await page.getByRole('button', { name: 'Save these 4 lines' }).click();
	await expect(page.getByText('Imported and saved: 4 lines')).toBeVisible();

	// The saved list shows the substitution worked out by the server.
	const c3 = saved.locator('tbody[data-part-line="C3"]');
	await expect(c3).toContainText('500 nF');
	await expect(c3).toContainText('+6.4 %');
	await expect(c3).toContainText('inside ±10 %');
	await expect(saved).toContainText(`metal film, e2e ${tag}`);

	// Export: RFC 4180 CSV with the values as typed.
	const href = await page.getByRole('link', { name: 'Export CSV' }).getAttribute('href');
	const res = await page.request.get(href!);
	expect(res.status()).toBe(200);
	expect(res.headers()['content-type']).toBe('text/csv; charset=utf-8');
	expect(res.headers()['content-disposition']).toBe(`attachment; filename="${SLUG}-parts.csv"`);
	const csv = await res.text();
	expect(csv.split('\r\n')[0]).toContain('designators,quantity,kind,value');
	expect(csv).toContain('C3,1,capacitor,2×1u series,10,63');
	expect(csv).toContain(`"metal film, e2e ${tag}"`);
	expect(csv.endsWith('\r\n')).toBe(true);

	// A draft's CSV is not for others.
	const anon = await page.context().browser()!.newContext({ baseURL: new URL(page.url()).origin });
	const other = await anon.request.get(href!);
	expect(other.status()).toBe(404);
	expect((await other.json()).error.code).toBe('not_found');
	await anon.close();
});

test('parts editor: a bad value is refused with its line number, nothing saved; the live hint shows the network value', async ({ page }) => {
	await signIn(page, JOSS);
	await page.goto(`/builds/${SLUG}/edit/parts`);
	await expect(page.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
	const lines = page.locator('tr[data-line]');
	const count = await lines.count();
	await page.getByRole('button', { name: 'Add a line' }).click();
	const n = count + 1;
	await page.locator(`#l${n}-designators`).fill('C20');
	await page.locator(`#l${n}-kind`).selectOption('capacitor');
	await page.locator(`#l${n}-value`).fill('2u2||2u2');
	await expect(page.locator(`#l${n}-value-hint`)).toContainText('two 2.20 µF in parallel = 4.40 µF');
	await page.locator(`#l${n}-value`).fill('4u7x');
	await page.getByRole('button', { name: 'Save parts list' }).click();
	await expect(page.getByRole('alert').filter({ hasText: 'Nothing was saved' })).toContainText(`Line ${n}, value`);
	await expect(page.locator(`#l${n}-value`)).toHaveAttribute('aria-invalid', 'true');
	await page.reload();
	await expect(page.locator('tr[data-line]')).toHaveCount(count);
});

test('another maker cannot see or change the parts list and spec blocks of a draft that is not theirs', async ({ page }) => {
	await signIn(page, 'aiko@starground.test');
	for (const path of ['parts', 'specs']) {
		const view = await page.goto(`/builds/${SLUG}/edit/${path}`);
		expect(view?.status()).toBe(404);
	}
	const origin = new URL(page.url()).origin;
	const save = await page.request.post(`/builds/${SLUG}/edit/parts?/save`, {
		headers: { origin, accept: 'text/html' },
		form: { designators: 'R1', quantity: '1', kind: 'resistor', value: '1k', tolerance: '', ratingV: '', ratingW: '', package: '', notes: '', designValue: '', reason: '' }
	});
	// View before edit: the actions answer 404 like the pages, so the draft's existence never leaks.
	expect(save.status()).toBe(404);
	const spec = await page.request.post(`/builds/${SLUG}/edit/specs?/save`, {
		headers: { origin, accept: 'text/html' },
		multipart: { kind: 'thermal', id: '', title: 'not mine', powerW: '10', ambientC: '40', junctionMaxC: '150', rthJcKPerW: '1', rthCsKPerW: '0.4', rthSaKPerW: '2' }
	});
	expect(spec.status()).toBe(404);
});

test.describe('without JavaScript', () => {
	test.use({ javaScriptEnabled: false });

	test('the parts editor adds a line and reports a bad value by posting the form', async ({ page }) => {
		await signIn(page, JOSS);
		await page.goto(`/builds/${SLUG}/edit/parts`);
		const count = await page.locator('tr[data-line]').count();
		await page.getByRole('button', { name: 'Add a line' }).click();
		await expect(page.locator('tr[data-line]')).toHaveCount(count + 1);
		await expect(page.getByText('Unsaved changes.')).toBeVisible();
		const n = count + 1;
		await page.locator(`#l${n}-designators`).fill('L1');
		await page.locator(`#l${n}-kind`).selectOption('inductor');
		await page.locator(`#l${n}-value`).fill('10 apples');
		await page.getByRole('button', { name: 'Save parts list' }).click();
		await expect(page.getByRole('alert').filter({ hasText: 'Nothing was saved' })).toContainText(`Line ${n}, value`);
		// What was typed is still in the form.
		await expect(page.locator(`#l${n}-value`)).toHaveValue('10 apples');
	});
});
