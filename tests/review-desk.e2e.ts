// The review desk end to end in Chromium: a maker asks for review of a mains build with a DANGER check and a
// step photo, leaving a note; a reviewer filters the desk to mains builds with DANGER checks, claims the build
// (another reviewer sees the claim), reviews it with the photo and the mains checklist, is held to the
// checklist rule, and signs off; the maker sees the checklist with the sign-off on the build page.
import { test, expect } from '@playwright/test';
import sharp from 'sharp';
import { signedInPage } from './helpers/auth';
import { createPublishedBuild, postForm, SUPPLY_FORM, origin } from './helpers/builds';

const as = signedInPage;

test('filter the desk to mains + DANGER, claim, review with photo and checklist, sign off; the maker sees the checklist', async ({ browser }) => {
	test.setTimeout(180_000);
	const joss = await as(browser, 'joss@starground.test');
	const build = await createPublishedBuild(joss, { supply: false });
	const buildUrl = `/builds/${build.slug}`;

	// A supply block with no enclosure on a mains build: a DANGER check (supply.no-enclosure).
	const saved = await postForm(joss.request, `${buildUrl}/edit/specs?/save`, { ...SUPPLY_FORM, chassis: 'none' });
	expect(saved.status(), 'save supply block').toBe(303);
	// A photo on the mains step.
	await joss.goto(`${buildUrl}/edit`, { waitUntil: 'networkidle' });
	const stepId = await joss.locator('[data-step-editor]').filter({ hasText: 'Mains inlet and fuse' }).first().getAttribute('data-step-id');
	const jpeg = await sharp({ create: { width: 900, height: 600, channels: 3, background: '#3b6e8f' } }).jpeg().toBuffer();
	const up = await joss.request.post(`${buildUrl}/photos`, {
		headers: { accept: 'application/json', origin: origin() },
		multipart: { file: { name: 'inlet.jpg', mimeType: 'image/jpeg', buffer: jpeg }, alt: 'Fused inlet with the earth lead to the chassis stud', purpose: 'step', stepId: stepId! }
	});
	expect(up.status(), 'upload step photo').toBe(201);
	// The schematic as a file, then all of it published as Rev B; one more step stays unpublished (pending).
	const pdf = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n');
	const file = await joss.request.post(`${buildUrl}/attachments`, {
		headers: { origin: origin(), accept: 'application/json' },
		multipart: { kind: 'schematic', file: { name: 'inlet-schematic.pdf', mimeType: 'application/pdf', buffer: pdf } }
	});
	expect(file.status(), 'attach the schematic').toBe(201);
	const rev = await postForm(joss.request, `${buildUrl}/edit?/publishChanges`, { note: 'Supply block, inlet photo and the schematic.' });
	expect(rev.status(), 'publish Rev B').toBe(200);
	const pending = await postForm(joss.request, `${buildUrl}/edit?/addStep`, { title: 'Lid and feet', bodyMd: 'Rubber feet; the lid is not fitted yet.' });
	expect(pending.status(), 'add a pending step').toBe(200);

	// The maker asks for review with a note.
	await joss.goto(`${buildUrl}/request-review`, { waitUntil: 'networkidle' });
	await joss.getByLabel('Note for the reviewer (optional)').fill('The case is still open on the bench — is the inlet wiring right?');
	await joss.getByRole('button', { name: /on the review desk/ }).click();
	await expect(joss.locator('[data-outcome]')).toHaveText(/Review asked/);

	// The reviewer filters the desk: mains powered, with DANGER checks, most DANGER first.
	const maren = await as(browser, 'maren@starground.test');
	await maren.goto('/review-desk', { waitUntil: 'networkidle' });
	const filters = maren.locator('[data-desk-filters]');
	await filters.getByLabel('Mains powered').check();
	await filters.getByLabel('Has DANGER checks').check();
	await filters.getByLabel('Order').selectOption('danger');
	await filters.getByRole('button', { name: 'Show' }).click();
	// The address is the short form of the query (defaults left out), so it can be shared.
	await expect(maren).toHaveURL(/\/review-desk\?mains=1&danger=1&sort=danger$/);
	// Every row shown is mains powered with at least one DANGER check; ours is among them (on this page or a later one).
	for (const r of await maren.locator('[data-desk-build]').all()) {
		await expect(r.locator('[data-mains]')).toBeVisible();
		expect(Number(await r.locator('[data-danger]').getAttribute('data-danger'))).toBeGreaterThan(0);
	}
	let row = maren.locator(`[data-desk-build="${build.slug}"]`);
	for (let i = 0; i < 20 && !(await row.count()); i++) {
		await maren.locator('[data-desk-next]').click();
		await maren.waitForLoadState('networkidle');
		row = maren.locator(`[data-desk-build="${build.slug}"]`);
	}
	await expect(row).toBeVisible();
	await expect(row.locator('[data-maker-note]')).toContainText('is the inlet wiring right?');

	// Claim it; the desk says so, and another reviewer sees who is on it.
	await row.getByRole('button', { name: "I'm reviewing this" }).click();
	await expect(maren.locator('[data-outcome]')).toHaveText(/Claimed/);
	await expect(maren).toHaveURL(/mains=1&danger=1&sort=danger&done=claimed/);
	row = maren.locator(`[data-desk-build="${build.slug}"]`);
	await expect(row.locator('[data-claimed-by]')).toContainText('You are reviewing this');
	const oskar = await as(browser, 'oskar@starground.test');
	await oskar.goto(`/review-desk?mains=1&danger=1`, { waitUntil: 'networkidle' });
	const seen = oskar.locator(`[data-desk-build="${build.slug}"]`);
	if (await seen.count()) {
		await expect(seen.locator('[data-claimed-by]')).toContainText('Maren Quist is reviewing this');
		await expect(seen.getByRole('button', { name: "I'm reviewing this" })).toHaveCount(0);
	}
	// A forged claim by the other reviewer is refused on the server.
	const buildId = await row.getAttribute('id');
	const forged = await postForm(oskar.request, '/review-desk?/claim', { buildId: buildId!.replace(/^desk-/, '') });
	expect(forged.status()).toBe(409);

	// The review page: the maker's note, the claim, the step photo inline, the checklist.
	await row.getByRole('link', { name: 'Review' }).click();
	await expect(maren).toHaveURL(new RegExp(`${buildUrl}/review$`));
	await expect(maren.locator('[data-review-request] [data-maker-note]')).toContainText('is the inlet wiring right?');
	await expect(maren.locator('[data-review-request] [data-claimed-by]')).toContainText('You are reviewing this');
	const photo = maren.locator('[data-review-target="step"]').filter({ hasText: 'Mains inlet and fuse' }).locator('[data-step-photos] img');
	await expect(photo).toHaveAttribute('alt', 'Fused inlet with the earth lead to the chassis stud');
	await expect.poll(() => photo.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBeGreaterThan(0);
	// Rev B as published — its files listed with type and size — and the unpublished step only under "Pending changes".
	await expect(maren.locator('[data-reviewed-revision]')).toContainText('Rev B as published');
	const files = maren.locator('[data-review-files] [data-attachment="inlet-schematic.pdf"]');
	await expect(files).toContainText('Schematic · PDF');
	await expect(files.locator('[data-size]')).toHaveText(`${pdf.length} bytes`);
	await expect(maren.locator('[data-review-target="step"]')).toHaveCount(2);
	await expect(maren.locator('[data-review-target="step"]').filter({ hasText: 'Lid and feet' })).toHaveCount(0);
	const pendingBox = maren.locator('[data-pending-changes]');
	await expect(pendingBox).toContainText('Pending changes — not published, not under review');
	await pendingBox.getByText('Show the pending changes').click();
	await expect(pendingBox.locator('[data-step-diff="added"]')).toContainText('Lid and feet');
	const checklist = maren.locator('[data-checklist]');
	await expect(checklist.locator('input[type="checkbox"]')).toHaveCount(6);
	await expect(checklist).toContainText('IEC 62368-1');
	await expect(checklist).toContainText('common practice, no single source');

	// Five of six ticked and no reason: the sign-off is refused with a sentence; with a reason it goes through.
	await maren.getByRole('radio', { name: /^Sign off as safe —/ }).check();
	await maren.getByLabel(/^Summary/).fill('Inlet wiring, earth bond and fuse checked from the photo and the steps.');
	for (const label of ['Protective-earth continuity', 'Fuse in the live conductor', 'Mains wiring insulated', 'Creepage and clearance', 'Reservoir capacitors discharge']) {
		await checklist.getByLabel(new RegExp(label)).check();
	}
	// Tagging and clearing a hazard meanwhile keeps what was typed and ticked.
	const heatsink = maren.locator('[data-review-target="step"]').filter({ hasText: 'Heatsink and mounting' });
	await heatsink.getByText(/Tag a hazard on step 2/).click();
	await heatsink.getByLabel('What kind of hazard').selectOption('heat');
	await heatsink.getByLabel('Look again').check();
	await heatsink.getByLabel(/^Note/).fill('Check the tab insulation with a meter before power-up.');
	await heatsink.getByRole('button', { name: 'Tag the hazard' }).click();
	await expect(heatsink.locator('[data-flag]')).toHaveCount(1);
	await heatsink.getByText('Clear the tag…').click();
	await heatsink.getByLabel(/^Note on clearing/).fill('Advice only; nothing to fix.');
	await heatsink.getByRole('button', { name: 'Clear the tag' }).click();
	await expect(heatsink.locator('[data-flag-state="resolved"]')).toHaveCount(1);
	await expect(maren.getByLabel(/^Summary/)).toHaveValue('Inlet wiring, earth bond and fuse checked from the photo and the steps.');
	await expect(checklist.locator('input:checked')).toHaveCount(5);
	await maren.getByRole('button', { name: /Record the review of Rev B/ }).click();
	await expect(maren.getByRole('alert')).toContainText('1 of 6 checklist items are not ticked');
	await maren.getByLabel(/^Why items are left unticked/).fill('No heatsink on this board: the chip runs from the case floor, checked separately.');
	await maren.getByRole('button', { name: /Record the review of Rev B/ }).click();
	await expect(maren).toHaveURL(new RegExp(`${buildUrl}\\?done=review-safe(#review-state)?$`));
	await expect(maren.locator('[data-outcome]')).toHaveText(/Review recorded: you signed this revision off as safe/);

	// The maker sees the sign-off with its checklist, the reason for the unticked item, and the peer-opinion sentence.
	await joss.goto(buildUrl, { waitUntil: 'networkidle' });
	await expect(joss.locator('#review-state [data-review-label]')).toHaveText(/Signed off as safe at Rev B/);
	await expect(joss.locator('#review-state [data-checklist-summary] summary')).toHaveText(/Mains checklist: 5 of 6 ticked/);
	const listed = joss.locator('[data-review="safe"] [data-review-checklist]');
	await expect(listed.locator('[data-ticked="true"]')).toHaveCount(5);
	await expect(listed.locator('[data-checklist-item="heatsink-isolation"]')).toHaveAttribute('data-ticked', 'false');
	await expect(joss.locator('[data-review="safe"] [data-checklist-note]')).toContainText('No heatsink on this board');
	await expect(joss.locator('[data-peer-opinion]')).toContainText('not a certification');
	// The request is gone from the desk.
	await maren.goto('/review-desk?mains=1&danger=1', { waitUntil: 'networkidle' });
	await expect(maren.locator(`[data-desk-build="${build.slug}"]`)).toHaveCount(0);
});

test('a hazard tag thread: the maker answers the reviewer on the tag page, without JavaScript too', async ({ browser }) => {
	test.setTimeout(120_000);
	const joss = await as(browser, 'joss@starground.test');
	const build = await createPublishedBuild(joss);
	const maren = await as(browser, 'maren@starground.test');
	await maren.goto(`/builds/${build.slug}/review`, { waitUntil: 'networkidle' });
	const heatsink = maren.locator('[data-review-target="step"]').filter({ hasText: 'Heatsink and mounting' });
	await heatsink.getByText(/Tag a hazard on step 2/).click();
	await heatsink.getByLabel('What kind of hazard').selectOption('heat');
	await heatsink.getByLabel('Fix before use').check();
	await heatsink.getByLabel(/^Note/).fill('What insulates the tab from the heatsink?');
	await heatsink.getByRole('button', { name: 'Tag the hazard' }).click();
	await expect(heatsink.locator('[data-flag]')).toHaveCount(1);
	await heatsink.locator('[data-thread-link]').click();
	await expect(maren.getByRole('heading', { name: /Thread/ })).toBeVisible();
	await maren.getByLabel('Your message (Markdown)').fill('Also: what torque on the clamp screw?');
	await maren.getByRole('button', { name: 'Add to the thread' }).click();
	await expect(maren.locator('[data-outcome]')).toHaveText(/Message added/);
	const tagUrl = new URL(maren.url()).pathname;

	// The maker answers from a browser without JavaScript (signed in with the same session cookie).
	const ctx = await browser.newContext({ javaScriptEnabled: false, storageState: await joss.context().storageState() });
	const plain = await ctx.newPage();
	await plain.goto(tagUrl);
	await plain.getByLabel('Your message (Markdown)').fill('A **silicone pad** and a shoulder washer; 0.6 N·m.');
	await plain.getByRole('button', { name: 'Add to the thread' }).click();
	await expect(plain.locator('[data-outcome]')).toHaveText(/Message added/);
	await expect(plain.locator('[data-flag-message="maker"] .prose strong')).toHaveText('silicone pad');
	await expect(plain.locator('[data-flag-message]')).toHaveCount(2);
	await ctx.close();
});
