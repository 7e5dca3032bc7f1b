// The build side of the maker's workshop in Chromium: the build status (set in the editor, shown on the
// build page and its card, filtered on the browse page); /welcome after confirming the mail; attachments
// (upload with progress, download as a file, hostile files refused with nothing left behind).
import { test, expect } from '@playwright/test';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import sharp from 'sharp';
import { expectSignedIn, signIn, uniqueEmail } from './helpers/auth';
import { createPublishedBuild, origin, postForm, uniqueTitle } from './helpers/builds';
import { waitForMail, linkIn } from './helpers/mail';

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

test('/welcome after confirming the mail: signed in, or it says plainly how to sign in', async ({ page, browser }) => {
	test.setTimeout(90_000);
	const email = uniqueEmail('welcome');
	await page.goto('/sign-up');
	await page.getByLabel('Display name').fill('Wren Welcome');
	await page.getByLabel('Handle').fill(`wl${Date.now().toString(36)}`);
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('solder-and-flux-1');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByRole('heading', { name: 'Check your mail' })).toBeVisible();
	const link = linkIn(await waitForMail(email, /Confirm your e-mail/), '/api/auth/verify-email');

	// Confirmed in the browser that signed up: signed in, and the page says so.
	await page.goto(link);
	await expect(page.locator('[data-welcome]')).toHaveAttribute('data-welcome', 'signed-in');
	await expect(page.getByText('You are signed in.')).toBeVisible();
	await expectSignedIn(page);

	// The same link again in another browser: not signed in there, and the page says how to sign in.
	const other = await browser.newContext();
	const p2 = await other.newPage();
	await p2.goto(link);
	await expect(p2).toHaveURL(/\/welcome/);
	await expect(p2.locator('[data-welcome]')).toHaveAttribute('data-welcome', 'signed-out');
	await expect(p2.getByText('sign in with the e-mail address and the password you chose')).toBeVisible();
	await p2.locator('[data-welcome]').getByRole('link', { name: 'Go to sign-in' }).click();
	await p2.getByLabel('E-mail').fill(email);
	await p2.getByLabel('Password').fill('solder-and-flux-1');
	await p2.getByRole('button', { name: 'Sign in' }).click();
	await expectSignedIn(p2);

	// A link that cannot be used (cut short): the page says so and how to go on, never a bare error.
	const p3 = await (await browser.newContext()).newPage();
	await p3.goto(link.replace(/token=[^&]+/, 'token=cut-short'));
	await expect(p3.locator('[data-welcome]')).toHaveAttribute('data-welcome', 'invalid');
	await expect(p3.getByRole('heading', { name: 'That confirmation link cannot be used' })).toBeVisible();
	await expect(p3.locator('[data-welcome]').getByRole('link', { name: 'Go to sign-in' })).toBeVisible();
	await other.close();
});

/** A minimal PDF 1.4 file (ISO 32000-1 §7.5 layout). */
const PDF = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n');

/** Every stored key under attachments/ in the test object store (the same S3 the app uses). */
async function attachmentKeys(): Promise<string[]> {
	const s3 = new S3Client({
		region: process.env.S3_REGION ?? 'us-east-1',
		endpoint: process.env.S3_ENDPOINT,
		forcePathStyle: true,
		credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? 'S3RVER', secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? 'S3RVER' }
	});
	const res = await s3.send(new ListObjectsV2Command({ Bucket: process.env.S3_BUCKET ?? 'starground', Prefix: 'attachments/' }));
	return (res.Contents ?? []).map((o) => o.Key!).sort();
}

test('attachments: upload with progress, listed on the build page, downloaded as a file; hostile files refused, nothing left behind', async ({ page, browser }) => {
	test.setTimeout(120_000);
	await signIn(page, JOSS);
	const { slug } = await createPublishedBuild(page, { supply: false });
	await page.goto(`/builds/${slug}/edit`);
	const uploader = page.locator('[data-attachment-uploader][data-ready="true"]');
	await uploader.getByLabel('What it is').selectOption('schematic');
	await uploader.getByLabel('File').setInputFiles({ name: 'Schéma ampli rev B.pdf', mimeType: 'application/pdf', buffer: PDF });
	await uploader.getByRole('button', { name: 'Attach file' }).click();
	await expect(uploader.getByRole('status')).toHaveText(`Attached “Schéma ampli rev B.pdf” (${PDF.length} bytes).`);
	await expect(page.locator('[data-files-panel] [data-attachment]')).toHaveCount(1);
	const keysAfterGood = await attachmentKeys();

	// Hostile files: an HTML page renamed .pdf and an SVG drawing — a sentence back, no row, no object.
	for (const bad of [
		{ name: 'schematic.pdf', mimeType: 'application/pdf', buffer: Buffer.from('<!doctype html><html><body><script>alert(document.cookie)</script></body></html>') },
		{ name: 'enclosure.svg', mimeType: 'image/svg+xml', buffer: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><rect width="9" height="9"/></svg>') }
	]) {
		await uploader.getByLabel('File').setInputFiles(bad);
		await uploader.getByRole('button', { name: 'Attach file' }).click();
		await expect(uploader.getByRole('alert')).toContainText('That file was not added: It looks like a web page or an SVG drawing');
		await expect(uploader.getByRole('alert')).toContainText('Attach a PDF, a PNG or JPEG image, or a ZIP archive');
	}
	await page.reload();
	await expect(page.locator('[data-files-panel] [data-attachment]')).toHaveCount(1);
	expect(await attachmentKeys()).toEqual(keysAfterGood);

	// The build page lists it (name, what it is, type, size) and serves it as a download, never inline.
	await page.goto(`/builds/${slug}`);
	const item = page.locator('#files [data-attachment="Schéma ampli rev B.pdf"]');
	await expect(item).toContainText('Schematic · PDF');
	await expect(item.locator('[data-size]')).toHaveText(`${PDF.length} bytes`);
	const [download] = await Promise.all([page.waitForEvent('download'), item.getByRole('link', { name: 'Schéma ampli rev B.pdf', exact: true }).click()]);
	expect(download.suggestedFilename()).toBe('Schéma ampli rev B.pdf');
	const href = await item.getByRole('link', { name: 'Schéma ampli rev B.pdf', exact: true }).getAttribute('href');
	const res = await page.request.get(href!);
	expect(res.status()).toBe(200);
	expect(res.headers()['content-disposition']).toMatch(/^attachment; filename="[\x20-\x7e]+"; filename\*=UTF-8''Sch%C3%A9ma%20ampli%20rev%20B\.pdf$/);
	expect(res.headers()['x-content-type-options']).toBe('nosniff');
	expect(Buffer.from(await res.body()).equals(PDF)).toBe(true);

	// Revisions record it: the pending changes say a file was added.
	await page.goto(`/builds/${slug}/edit`);
	await expect(page.locator('[data-pending-changes]')).toContainText('attachments: 1 added');

	// Removed: gone from the list, the object deleted, the download 404.
	await page.locator('[data-files-panel] [data-attachment]').getByRole('button', { name: /Remove/ }).click();
	await expect(page.locator('[data-files-panel] [data-attachment]')).toHaveCount(0);
	expect((await page.request.get(href!)).status()).toBe(404);
	await expect.poll(async () => (await attachmentKeys()).length).toBe(keysAfterGood.length - 1);

	// A draft's file: its maker downloads it; a reader signed out gets 404, as for the draft itself.
	const created = await postForm(page.request, '/builds/new', { title: uniqueTitle('Files draft'), summary: '', category: 'preamp', topology: 'passive', licence: 'CC-BY-SA-4.0' });
	const draftSlug = new URL(created.headers()['location'], origin()).pathname.split('/')[2];
	const up = await page.request.post(`/builds/${draftSlug}/attachments`, {
		headers: { origin: origin(), accept: 'application/json' },
		multipart: { kind: 'pcb', file: { name: 'board.pdf', mimeType: 'application/pdf', buffer: PDF } }
	});
	expect(up.status()).toBe(201);
	const draftUrl = (await up.json()).attachment.url as string;
	expect((await page.request.get(draftUrl)).status()).toBe(200);
	const stranger = await browser.newContext();
	expect((await stranger.request.get(`${origin()}${draftUrl}`)).status()).toBe(404);
	await stranger.close();
});

test('step editor: a Markdown preview beside the text, a photo of the build placed in the text, code and quotes rendered', async ({ page }) => {
	test.setTimeout(120_000);
	await signIn(page, JOSS);
	const { slug } = await createPublishedBuild(page, { supply: false });
	await page.goto(`/builds/${slug}/edit`);
	const step = page.locator('[data-step-editor]').first();
	const stepId = await step.getAttribute('data-step-id');
	const png = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#b0592b' } }).png().toBuffer();
	const up = await page.request.post(`/builds/${slug}/photos`, {
		headers: { origin: origin(), accept: 'application/json' },
		multipart: { purpose: 'step', stepId: stepId!, alt: 'Output stage with the driver transistors fitted', file: { name: 'stage.png', mimeType: 'image/png', buffer: png } }
	});
	expect(up.status()).toBe(201);
	const photoId = (await up.json()).photo.id as string;
	await page.reload();

	const field = step.locator('[data-markdown-field][data-ready="true"]');
	const text = field.locator('textarea');
	await text.fill('Fit `0R22` emitter resistors.\n\n> Check the rails before fitting the chips.\n\nThen:');
	const preview = field.locator('[data-preview]');
	await expect(preview.locator('p > code')).toHaveText('0R22');
	await expect(preview.locator('blockquote p')).toHaveText('Check the rails before fitting the chips.');
	// No quotation marks or backticks added around them by the page's styles.
	expect(await preview.locator('p > code').evaluate((el) => getComputedStyle(el, '::before').content)).toMatch(/^(none|normal)$/);
	expect(await preview.locator('blockquote p').evaluate((el) => getComputedStyle(el, '::before').content)).toMatch(/^(none|normal)$/);

	// Place the photo at the end of the text: the preview shows it there, from this build's own photos.
	await text.focus();
	await text.press('End');
	await step.locator(`[data-step-photo="${photoId}"]`).getByRole('button', { name: /Place this photo in the text/ }).click();
	await expect(text).toHaveValue(new RegExp(`\\[\\[photo:${photoId.slice(0, 8)}\\]\\]`));
	await expect(preview.locator('img.placed-photo')).toHaveAttribute('src', new RegExp(`^/media/photos/${photoId}/`));
	await step.getByRole('button', { name: /^Save step 1/ }).click();
	await expect(step.getByText('Saved.')).toBeVisible();

	// On the build page the photo stands in the text, after the quote, and not again above it.
	await page.goto(`/builds/${slug}`);
	const shown = page.locator('[data-step]').first();
	await expect(shown.locator('img.placed-photo')).toHaveAttribute('alt', 'Output stage with the driver transistors fitted');
	await expect(shown.locator('figure')).toHaveCount(0);
	await expect(shown.locator('blockquote')).toContainText('Check the rails');
});

test.describe('phone (390×844)', () => {
	test.use({ viewport: { width: 390, height: 844 } });
	test('build page: page index, review summary and based-on come before the comments; Archive asks first and says what happened', async ({ page }) => {
		test.setTimeout(90_000);
		await signIn(page, JOSS);
		const { slug } = await createPublishedBuild(page, { supply: false });
		await page.goto(`/builds/${slug}`);
		const top = async (sel: string) => (await page.locator(sel).first().boundingBox())!.y;
		const comments = await top('[data-comments]');
		for (const sel of ['nav[aria-label="On this page"]', '#review-state', '#based-on']) {
			await expect(page.locator(sel).first()).toBeVisible();
			expect(await top(sel), `${sel} above the comments`).toBeLessThan(comments);
		}
		// Archive: one click opens the question; nothing happens until it is confirmed.
		await page.locator('[data-archive-confirm] summary').click();
		await expect(page.getByText('Archive this build? It leaves the lists')).toBeVisible();
		await page.getByRole('button', { name: 'Yes, archive it' }).click();
		await expect(page.getByText('Archived: it has left the lists but stays readable here.')).toBeVisible();
		await expect(page.locator('[data-build] header [data-status]')).toHaveText('Archived');
	});
});
