// The whole maker flow in ONE test, end to end in Debian's Chromium, at desktop width and on a 390×844 phone:
// sign up and confirm by mail → a discrete class-AB build on ±30 V rails from the header's member menu → steps,
// one with a photo → an amplifier and a supply spec block → a parts list typed in the trade's notation (0R22, 4k7),
// a CSV import added to it (10000u, prices) and an edit that keeps every line → publish (Rev A) → a batch of edits
// (step text, a per-channel flag, an attached schematic) published as ONE revision with a change note, and its diff
// → the attachment downloaded as a file → the costed parts list exported as CSV and imported back unchanged → review
// asked with a note. The pieces are tested on their own in workshop, parts-grid and build-side; this is the path a
// new maker walks through them.
import { test, expect } from '@playwright/test';
import sharp from 'sharp';
import { expectSignedIn, openMemberMenu, uniqueEmail } from './helpers/auth';
import { waitForMail, linkIn } from './helpers/mail';
import { publishChangesAndOpenDiff, uniqueTitle } from './helpers/builds';
import { COSTED_CSV_HEADER, fillByLabel, importCsv } from './helpers/parts';
import { SIZES } from './helpers/sizes';

/** A minimal PDF 1.4 file (ISO 32000-1 §7.5 layout): the "schematic". */
const PDF = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n');

/**
 * Lines added from a spreadsheet (CSV, RFC 4180: quoted fields with commas), priced. Hand calculation of the cost with
 * the amplifier block's 2 channels: C1, C2 2 × 3.20 EUR = 6.40 EUR; Q1, Q2 2 × 1.15 EUR = 2.30 EUR → EUR 8.70.
 * (After the batch edit R30, R31 become per channel, but they carry no price: "2 lines have no price".)
 */
const CSV_ADD = [
	COSTED_CSV_HEADER,
	'"C1, C2",2,capacitor,10000u,20,63,,snap-in,"reservoir, one per rail",,,,Any shop,3.20,EUR,',
	'"Q1, Q2",2,transistor,complementary output pair,,,,TO-3P,on the heatsink with mica,,,,Any shop,1.15,EUR,'
].join('\r\n');

for (const size of SIZES) {
	test.describe(size.name, () => {
		test.use({ viewport: size.viewport });

		test(`the whole maker flow, sign-up to review (${size.name})`, async ({ page }) => {
			test.setTimeout(300_000);

			// ── Sign up and confirm by mail; the header keeps search and, signed in, the member menu. ──
			const name = `Mira Maker ${size.name}`;
			const email = uniqueEmail(`maker-${size.name}`);
			await page.goto('/sign-up');
			await expect(page.getByRole('searchbox', { name: 'Search builds' })).toBeVisible();
			await page.getByLabel('Display name').fill(name);
			await page.getByLabel('Handle').fill(`mf${size.name[0]}${Date.now().toString(36)}`);
			await page.getByLabel('E-mail').fill(email);
			await page.getByLabel('Password').fill('heatsink-and-mica-1');
			await page.getByRole('button', { name: 'Create account' }).click();
			await expect(page.getByRole('heading', { name: 'Check your mail' })).toBeVisible();
			await page.goto(linkIn(await waitForMail(email, /Confirm your e-mail/), '/api/auth/verify-email'));
			await expectSignedIn(page, name);
			await expect(page.getByRole('searchbox', { name: 'Search builds' })).toBeVisible();

			// ── A new discrete class-AB build, from the member menu. ──
			await (await openMemberMenu(page)).getByRole('link', { name: 'New build' }).click();
			const title = uniqueTitle('Discrete class AB on ±30 V');
			await page.getByLabel('Title').fill(title);
			await page.getByLabel('Summary').fill('A two-channel discrete class-AB power amplifier on ±30 V rails, built on the bench.');
			await page.getByLabel('Category').selectOption('power-amp');
			await page.getByLabel('Topology').selectOption('class-ab-discrete');
			await page.getByLabel(/Mains powered/).check();
			await page.getByRole('button', { name: 'Create draft' }).click();
			await expect(page).toHaveURL(/\/builds\/[^/]+\/edit(\?|$)/);
			const slug = new URL(page.url()).pathname.split('/')[2];

			// ── Steps, the first with a photo. ──
			const addStep = async (stepTitle: string, text: string, n: number) => {
				const add = page.locator('form[action="?/addStep"]');
				await add.getByLabel('Title').fill(stepTitle);
				await add.getByLabel('Text (Markdown)').fill(text);
				await add.getByRole('button', { name: 'Add step' }).click();
				await expect(page.getByRole('heading', { name: new RegExp(`Step ${n}\\s*${stepTitle}`) })).toBeVisible();
			};
			await addStep('Supply and rails', 'Toroid with two 22 V windings, a bridge and 10000u per rail: ±30 V off load.', 1);
			await addStep('Output stage', 'Emitter resistors 0R22, 5 W; the output pair on the heatsink with mica.', 2);
			const step1 = page.locator('[data-step-editor]').first();
			await step1.getByText('Add a photo to step 1').click();
			const uploader = step1.locator('form[data-purpose="step"][data-ready="true"]');
			const png = await sharp({ create: { width: 900, height: 600, channels: 3, background: '#6b7f5a' } }).png().toBuffer();
			await uploader.getByLabel('Step photo').setInputFiles({ name: 'rails.png', mimeType: 'image/png', buffer: png });
			await uploader.getByLabel('Description (alt text)').fill('Reservoir capacitors and the bridge on the supply board');
			await uploader.getByRole('button', { name: 'Upload photo' }).click();
			await expect(uploader.getByRole('status')).toHaveText('Photo added.');
			await expect(step1.locator('[data-step-photo]')).toHaveCount(1);

			// ── Spec blocks: the amplifier on ±30 V rails (as typed), then the supply. ──
			await page.goto(`/builds/${slug}/edit/specs`);
			await page.getByRole('link', { name: /Amplifier/ }).first().click();
			await expect(page.getByRole('heading', { name: 'Add an amplifier block' })).toBeVisible();
			await expect(page.locator('form[data-ready="true"]')).toBeVisible();
			await page.getByLabel('Topology').selectOption('class-ab-discrete');
			await fillByLabel(page, {
				Title: 'Output stage',
				Channels: '2',
				'Rail voltage': '±30',
				'Nominal load': '8R',
				'Max total supply': '140',
				'Dropout per side': '4',
				'Junction max': '150',
				'Rth junction–case': '0.8',
				'Minimum load': '4R'
			});
			await page.getByRole('button', { name: 'Add block' }).click();
			await expect(page.getByText('Block saved.')).toBeVisible();
			const amp = page.locator('section[data-spec-block="amplifier"]');
			await expect(amp).toContainText('±30');
			await page.getByRole('link', { name: /Power supply/ }).first().click();
			await expect(page.locator('form[data-ready="true"]')).toBeVisible();
			await fillByLabel(page, {
				Title: 'Supply',
				'Transformer rating': '300',
				'Secondary per rail': '22',
				'Reservoir per rail': '10000u',
				'Reservoir voltage rating': '63',
				'Load current per rail': '2',
				'Fuse rating': '2'
			});
			await page.getByLabel('Fuse type').selectOption('slow');
			await page.getByRole('button', { name: 'Add block' }).click();
			await expect(page.getByText('Block saved.')).toBeVisible();
			await expect(page.locator('section[data-spec-block="supply"]')).toBeVisible();

			// ── The parts list typed in the grid in the trade's notation. ──
			await page.goto(`/builds/${slug}/edit/parts`);
			await expect(page.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
			const lines = page.locator('#parts-form tr[data-line]');
			await page.getByRole('button', { name: 'Add a line' }).click();
			await page.getByLabel('Line 1, designators').fill('R30, R31');
			await page.getByLabel('Line 1, quantity').fill('2');
			await page.getByLabel('Line 1, power rating, W').fill('5');
			await page.getByLabel('Line 1, value (fitted)').fill('0R22');
			await page.getByLabel('Line 1, value (fitted)').press('Enter');
			await expect(lines).toHaveCount(2);
			await page.getByLabel('Line 2, designators').fill('R12');
			await page.getByLabel('Line 2, value (fitted)').fill('4k7');
			await page.getByRole('button', { name: 'Save parts list' }).click();
			await expect(page.getByText('Parts list saved: 2 lines')).toBeVisible();
			const saved = page.locator('section[aria-labelledby="saved-h"]');
			await expect(saved.locator('tbody[data-part-line="R30, R31"]')).toContainText('0R22 · 220 mΩ');
			await expect(saved.locator('tbody[data-part-line="R12"]')).toContainText('4k7 · 4.70 kΩ');

			// A CSV import added to the end, then an edit in the grid: every line is kept.
			await importCsv(page, CSV_ADD, 'append', 2);
			await expect(lines).toHaveCount(4);
			await expect(page.locator('#l3-value')).toHaveValue('10000u');
			await page.locator('#l2-notes').fill('input stage');
			await page.getByRole('button', { name: 'Save parts list' }).click();
			await expect(page.getByText('Parts list saved: 4 lines')).toBeVisible();
			for (const d of ['R30, R31', 'R12', 'C1, C2', 'Q1, Q2']) await expect(saved.locator(`tbody[data-part-line="${d}"]`)).toHaveCount(1);
			await expect(saved.locator('tbody[data-part-line="C1, C2"]')).toContainText('10000u · 10.0 mF');
			await page.reload();
			await expect(lines).toHaveCount(4);
			await expect(page.locator('#l2-notes')).toHaveValue('input stage');

			// ── Publish: Rev A. ──
			await page.goto(`/builds/${slug}/edit`);
			await page.locator('[data-publish-confirm] summary').click();
			await page.getByRole('button', { name: 'Yes, publish now' }).click();
			await expect(page).toHaveURL(new RegExp(`/builds/${slug}\\?published=1$`));
			await page.goto(`/builds/${slug}/edit`);
			await expect(page.getByText('No changes since Rev A')).toBeVisible();

			// ── A batch of edits: step text, a per-channel flag, an attached schematic. ──
			const step = page.locator('[data-step-editor]').first();
			await step.getByLabel('Text (Markdown)').fill('Toroid with two 22 V windings, a bridge and 10000u per rail: ±30 V off load.\nBleeder 4k7 across each rail.');
			await step.getByRole('button', { name: /Save step 1/ }).click();
			await expect(step.getByText('Saved.')).toBeVisible();
			await page.goto(`/builds/${slug}/edit/parts`);
			await expect(page.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
			await page.locator('#l1-perChannel').selectOption('yes');
			await page.getByRole('button', { name: 'Save parts list' }).click();
			await expect(page.getByText('Parts list saved: 4 lines')).toBeVisible();
			await page.goto(`/builds/${slug}/edit`);
			const files = page.locator('[data-attachment-uploader][data-ready="true"]');
			await files.getByLabel('What it is').selectOption('schematic');
			await files.getByLabel('File').setInputFiles({ name: 'schematic-rev-b.pdf', mimeType: 'application/pdf', buffer: PDF });
			await files.getByRole('button', { name: 'Attach file' }).click();
			await expect(files.getByRole('status')).toHaveText(`Attached “schematic-rev-b.pdf” (${PDF.length} bytes).`);

			// Still Rev A: all three wait as pending changes, then go out as ONE revision with a note.
			const pending = page.locator('[data-pending-changes]');
			await expect(pending).toContainText('1 step changed');
			await expect(pending).toContainText('parts: 1 changed');
			await expect(pending).toContainText('attachments: 1 added');
			await publishChangesAndOpenDiff(page, slug, 'Emitter resistors counted per channel; bleeders noted; schematic attached.');
			await expect(page.locator('[data-step-diff="changed"] [data-run="added"]')).toContainText('Bleeder 4k7 across each rail.');
			await expect(page.locator('[data-step-diff]')).toHaveCount(1);
			const partDiff = page.locator('[data-part-diff="changed"]');
			await expect(partDiff).toHaveCount(1);
			await expect(partDiff).toContainText('R30, R31 0R22');
			await expect(partDiff.locator('[data-field="per channel"] del')).toHaveText('no');
			await expect(partDiff.locator('[data-field="per channel"] ins')).toHaveText('yes');
			await expect(page.locator('[data-attachment-diff="added"]')).toContainText('schematic-rev-b.pdf');
			await expect(page.locator('[data-spec-diff]')).toHaveCount(0);

			// ── The build page: the photo, values as typed, the cost; the attachment downloads as a file. ──
			await page.goto(`/builds/${slug}`);
			await expect(page.getByRole('img', { name: 'Reservoir capacitors and the bridge on the supply board' })).toBeVisible();
			const parts = page.locator('#parts');
			await expect(parts.locator('tbody[data-part-line="R30, R31"]')).toContainText('0R22 · 220 mΩ');
			await expect(parts.locator('tbody[data-part-line="R30, R31"]')).toContainText('per ch. · 4 in all');
			await expect(parts.locator('[data-parts-cost] [data-total="EUR"]')).toHaveText('EUR 8.70');
			const item = page.locator('#files [data-attachment="schematic-rev-b.pdf"]');
			await expect(item).toContainText('Schematic · PDF');
			const link = item.getByRole('link', { name: 'schematic-rev-b.pdf', exact: true });
			const [download] = await Promise.all([page.waitForEvent('download'), link.click()]);
			expect(download.suggestedFilename()).toBe('schematic-rev-b.pdf');
			const file = await page.request.get((await link.getAttribute('href'))!);
			expect(file.status()).toBe(200);
			expect(file.headers()['content-disposition']).toMatch(/^attachment; filename="schematic-rev-b\.pdf"/);
			expect(Buffer.from(await file.body()).equals(PDF)).toBe(true);

			// ── The costed parts list: exported as CSV, imported back, exported again — the same bytes. ──
			const first = await page.request.get(`/api/v1/builds/${slug}/parts.csv`);
			expect(first.status()).toBe(200);
			const csv1 = await first.text();
			for (const bit of ['0R22', '4k7', '10000u', '"C1, C2"', 'Any shop,3.2', ',EUR,']) expect(csv1).toContain(bit);
			await page.goto(`/builds/${slug}/edit/parts`);
			await expect(page.locator('#parts-form')).toHaveAttribute('data-ready', 'true');
			await importCsv(page, csv1, 'replace', 4);
			expect(await (await page.request.get(`/api/v1/builds/${slug}/parts.csv`)).text()).toBe(csv1);
			// Nothing a reader sees changed: no pending changes after the round trip.
			await page.goto(`/builds/${slug}/edit`);
			await expect(page.getByText('No changes since Rev B')).toBeVisible();

			// ── Ask for review, with a note for the reviewer. ──
			await page.goto(`/builds/${slug}/request-review`);
			await page.getByLabel('Note for the reviewer (optional)').fill('Please look at the mains inlet and the earth bond; the bleeders are new in Rev B.');
			await page.getByRole('button', { name: 'Put Rev B on the review desk' }).click();
			await expect(page.locator('[data-outcome]')).toHaveText(/Review asked/);
			// The page never scrolls sideways on the way (the phone's width included).
			const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
			expect(overflow).toBeLessThanOrEqual(0);
		});
	});
}
