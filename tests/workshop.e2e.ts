// The maker's workshop end to end in Chromium, at desktop width and on a 390×844 phone: a CSV import
// followed by an edit keeps every line; two tabs on one parts list (the later save is refused with both
// lists shown); a batch of edits published as ONE revision with a note, and its diff; "My builds".
import { test, expect, type Page } from '@playwright/test';
import { openMemberMenu, signIn } from './helpers/auth';
import { createPublishedBuild, publishChangesAndOpenDiff, uniqueTitle } from './helpers/builds';
import { importCsv } from './helpers/parts';
import { SIZES } from './helpers/sizes';

const JOSS = 'joss@starground.test';

const CSV = [
	'designators,quantity,kind,value,tolerance_pct,rating_v,rating_w,package,notes',
	'R1,2,resistor,0R22,5,,5,wirewound,emitter resistors',
	'C1,2,capacitor,10000u,20,50,,snap-in,reservoir',
	',4,hardware,,,,,,M3 screws and mica insulators'
].join('\n');

const editorLines = (page: Page) => page.locator('#parts-form tr[data-line]');

for (const size of SIZES) {
	test.describe(size.name, () => {
		test.use({ viewport: size.viewport });

		test('parts list: a CSV import (add to the end) then an edit keeps every line', async ({ page }) => {
			test.setTimeout(120_000);
			await signIn(page, JOSS);
			const { slug } = await createPublishedBuild(page, { supply: false });
			await page.goto(`/builds/${slug}/edit/parts`);
			await expect(page.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
			await importCsv(page, CSV, 'replace', 3);
			await expect(editorLines(page)).toHaveCount(3);

			// Add one line at the end from a second CSV: the editor above shows all four lines at once.
			await importCsv(page, 'designators,quantity,kind,value,rating_v\nC20,4,capacitor,4700u,35', 'append', 1);
			await expect(editorLines(page)).toHaveCount(4);
			await expect(page.locator('#l4-designators')).toHaveValue('C20');

			// Change one quantity and save: four lines saved, the imported one among them.
			await page.locator('#l1-quantity').fill('4');
			await page.getByRole('button', { name: 'Save parts list' }).click();
			await expect(page.getByText('Parts list saved: 4 lines')).toBeVisible();
			const saved = page.locator('section[aria-labelledby="saved-h"]');
			for (const d of ['R1', 'C1', 'C20']) await expect(saved.locator(`tbody[data-part-line="${d}"]`)).toHaveCount(1);
			await expect(saved).toContainText('M3 screws and mica insulators');
			await page.reload();
			await expect(editorLines(page)).toHaveCount(4);
			await expect(page.locator('#l1-quantity')).toHaveValue('4');
		});
	});
}

test('parts list in two tabs: the later save is refused with both lists shown, and nothing is lost', async ({ browser }) => {
	test.setTimeout(120_000);
	const context = await browser.newContext();
	const a = await context.newPage();
	await signIn(a, JOSS);
	const { slug } = await createPublishedBuild(a, { supply: false });
	await a.goto(`/builds/${slug}/edit/parts`);
	await expect(a.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
	await importCsv(a, CSV, 'replace', 3);

	const b = await context.newPage();
	await a.reload();
	await b.goto(`/builds/${slug}/edit/parts`);
	await expect(a.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
	await expect(b.locator('#parts-form')).toHaveAttribute('data-ready', 'true');

	// Tab B saves first.
	await b.locator('#l2-ratingV').fill('63');
	await b.getByRole('button', { name: 'Save parts list' }).click();
	await expect(b.getByText('Parts list saved: 3 lines')).toBeVisible();

	// Tab A, still on the old list, saves its own change: refused, its line kept in the editor, the stored list shown.
	await a.locator('#l1-notes').fill('emitter resistors, 5 W');
	await a.getByRole('button', { name: 'Save parts list' }).click();
	const conflict = a.locator('[data-conflict]');
	await expect(conflict).toContainText('Nothing was saved: the parts list was changed elsewhere');
	await expect(a.locator('#l1-notes')).toHaveValue('emitter resistors, 5 W');
	const saved = a.locator('section[aria-labelledby="saved-h"]');
	await a.reload();
	await expect(a.locator('section[aria-labelledby="saved-h"] tbody[data-part-line="C1"]')).toContainText('63');
	await expect(saved).not.toContainText('emitter resistors, 5 W');
	await context.close();
});

test('a batch of edits on a published build is published as ONE revision with a note; the diff shows what changed', async ({ page }) => {
	test.setTimeout(120_000);
	await signIn(page, JOSS);
	const { slug } = await createPublishedBuild(page);
	await page.goto(`/builds/${slug}/edit`, { waitUntil: 'networkidle' });

	// Three small edits: change step 1's text twice, add a step.
	const step1 = page.locator('[data-step-editor]').first();
	const body = step1.getByLabel('Text (Markdown)');
	await body.fill('Fused IEC inlet; protective earth to the chassis stud.\nFuse: T1.6A.');
	await step1.getByRole('button', { name: /Save step 1/ }).click();
	await expect(step1.getByText('Saved.')).toBeVisible();
	// The step is added before the second save: a save's page refresh landing while the new-step form is being
	// filled would empty that form (seen once on a loaded machine).
	const add = page.locator('form[action="?/addStep"]');
	await add.getByLabel('Title').fill('Bring-up with a bulb tester');
	await add.getByLabel('Text (Markdown)').fill('60 W bulb in series with the primary for the first start.');
	await add.getByRole('button', { name: 'Add step' }).click();
	await expect(page.getByRole('heading', { name: /Step 3\s*Bring-up/ })).toBeVisible();
	await body.fill('Fused IEC inlet; protective earth to the chassis stud.\nFuse: T2A slow-blow, sized for the inrush.');
	const second = page.waitForResponse((r) => r.url().includes('updateStep'));
	await step1.getByRole('button', { name: /Save step 1/ }).click();
	expect((await second).status()).toBe(200);

	// Still Rev A: the edits wait as pending changes.
	await expect(page.locator('[data-pending-changes]')).toContainText('1 step added');
	await expect(page.locator('[data-pending-changes]')).toContainText('1 step changed');
	await publishChangesAndOpenDiff(page, slug, 'Fuse sized for inrush; bring-up step added.');

	// The diff: the changed line removed and added, the new step, nothing else.
	const changed = page.locator('[data-step-diff="changed"]');
	await expect(changed.locator('[data-run="added"]')).toContainText('Fuse: T2A slow-blow, sized for the inrush.');
	await expect(changed.locator('[data-run="removed"]')).toHaveCount(0);
	await expect(page.locator('[data-step-diff="added"]')).toContainText('Bring-up with a bulb tester');
	await expect(page.locator('[data-part-diff]')).toHaveCount(0);
});

for (const size of SIZES) {
	test(`"My builds" lists a draft, reachable from the header (${size.name})`, async ({ page }) => {
		await page.setViewportSize(size.viewport);
		await signIn(page, JOSS);
		const title = uniqueTitle('Workshop draft');
		await page.goto('/builds/new');
		await page.getByLabel('Title').fill(title);
		await page.getByLabel('Category').selectOption('power-amp');
		await page.getByLabel('Topology').selectOption('class-ab-discrete');
		await page.getByRole('button', { name: 'Create draft' }).click();
		await expect(page).toHaveURL(/\/edit/);
		await page.goto('/');
		// The member menu holds "My builds" at every width (on a phone the header keeps search and this menu).
		await expect(page.getByRole('searchbox', { name: 'Search builds' })).toBeVisible();
		await (await openMemberMenu(page)).getByRole('link', { name: 'My builds' }).click();
		await expect(page).toHaveURL(/\/my-builds$/);
		const drafts = page.locator('[data-my-builds="draft"]');
		await expect(drafts.getByRole('link', { name: title, exact: true })).toBeVisible();
	});
}
