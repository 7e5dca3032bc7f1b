import { test, expect, type Page } from '@playwright/test';
import sharp from 'sharp';
import { signIn } from './helpers/auth';

// Joss's draft build in the demo seed.
const SLUG = 'bench-stereo-chip-amp';
const JOSS = 'joss@starground.test';
const AIKO = 'aiko@starground.test';

/** A photo-sized JPEG of noise (so it stays a few hundred KB to MB, like a real photo). */
async function benchPhoto(width = 1800, height = 1200): Promise<Buffer> {
	return sharp({
		create: { width, height, channels: 3, background: '#b0592b', noise: { type: 'gaussian', mean: 128, sigma: 40 } }
	})
		.jpeg({ quality: 90 })
		.toBuffer();
}

async function origin(page: Page): Promise<string> {
	return new URL(page.url()).origin;
}

test('the maker uploads a cover with alt text, sees the progress bar, and the build page shows it with a srcset', async ({
	page
}) => {
	await signIn(page, JOSS);
	await page.goto(`/builds/${SLUG}/edit`);
	const uploader = page.locator('form[data-purpose="cover"]');
	await expect(uploader).toBeVisible();
	// The page has hydrated: the uploader sends by XHR with progress (without script it posts natively).
	await expect(uploader).toHaveAttribute('data-ready', 'true');

	const alt = `Folded aluminium case with both amplifier boards, ${Date.now().toString(36)}`;
	const jpeg = await benchPhoto();
	await uploader.getByLabel('Cover photo').setInputFiles({ name: 'cover.jpg', mimeType: 'image/jpeg', buffer: jpeg });

	// Submitting without alt text is refused in the browser before anything is sent.
	await uploader.getByRole('button', { name: 'Upload cover' }).click();
	await expect(uploader.getByText('Describe the photo for readers who cannot see it.')).toBeVisible();
	await expect(uploader.getByRole('progressbar')).toHaveCount(0);

	await uploader.getByLabel('Description (alt text)').fill(alt);
	const answered = page.waitForResponse((r) => r.url().endsWith(`/builds/${SLUG}/photos`) && r.request().method() === 'POST');
	await uploader.getByRole('button', { name: 'Upload cover' }).click();
	const bar = uploader.getByRole('progressbar', { name: 'Upload progress' });
	await expect(bar).toBeVisible();
	const response = await answered;
	expect(response.status()).toBe(201);
	const { photo } = (await response.json()) as { photo: { id: string; widths: number[]; alt: string } };
	expect(photo.alt).toBe(alt);
	expect(photo.widths).toEqual([320, 640, 1280]);
	await expect(uploader.getByRole('status')).toHaveText('Photo added.');
	await expect(bar).toHaveAttribute('aria-valuetext', '100%');

	// The build page shows the cover from our storage, with every width in its srcset.
	await page.goto(`/builds/${SLUG}`);
	const img = page.getByRole('img', { name: alt });
	await expect(img).toBeVisible();
	const srcset = await img.getAttribute('srcset');
	for (const w of [320, 640, 1280]) expect(srcset).toContain(`/media/photos/${photo.id}/${w}.webp ${w}w`);
	await expect(img).toHaveAttribute('width', '1280');
	await expect(img).toHaveAttribute('height', '853');
	await expect.poll(() => img.evaluate((el: HTMLImageElement) => el.complete && el.naturalWidth)).toBeGreaterThan(0);

	const src = await img.evaluate((el: HTMLImageElement) => el.currentSrc);
	const media = await page.request.get(src);
	expect(media.status()).toBe(200);
	expect(media.headers()['content-type']).toBe('image/webp');
	// The build is a draft: its photos are private to those who may see it, never in a shared cache.
	expect(media.headers()['cache-control']).toBe('private, max-age=300');
	expect(media.headers()['etag']).toBeTruthy();
});

test('the upload route refuses bad files with a sentence, and only the maker may add, delete or see photos of a draft', async ({
	page,
	browser
}) => {
	await signIn(page, JOSS);
	const base = await origin(page);
	const url = `${base}/builds/${SLUG}/photos`;
	const post = (p: Page, file: { name: string; mimeType: string; buffer: Buffer }, alt = 'A test photo') =>
		p.request.post(url, {
			headers: { accept: 'application/json', origin: base },
			multipart: { file, alt, purpose: 'cover' }
		});

	// Text named .jpg and sent as image/jpeg: the content decides.
	const text = await post(page, { name: 'board.jpg', mimeType: 'image/jpeg', buffer: Buffer.from('not a photo at all') });
	expect(text.status()).toBe(415);
	expect((await text.json()).error.message).toMatch(/not a JPEG, PNG or WebP image/);

	const jpeg = await benchPhoto(600, 400);
	const truncated = await post(page, { name: 'half.jpg', mimeType: 'image/jpeg', buffer: jpeg.subarray(0, jpeg.length >> 1) });
	expect(truncated.status()).toBe(422);
	expect((await truncated.json()).error.message).toMatch(/damaged or incomplete/);

	const bomb = await sharp({ create: { width: 8000, height: 6000, channels: 3, background: '#ffffff' } }).png().toBuffer();
	const huge = await post(page, { name: 'blank.png', mimeType: 'image/png', buffer: bomb });
	expect(huge.status()).toBe(413);
	expect((await huge.json()).error).toMatchObject({ code: 'too_large' });

	const noAlt = await post(page, { name: 'ok.jpg', mimeType: 'image/jpeg', buffer: jpeg }, '   ');
	expect(noAlt.status()).toBe(400);
	expect((await noAlt.json()).error.issues[0].path).toBe('alt');

	// Another maker: 403, for adding and for deleting.
	const ok = await post(page, { name: 'ok.jpg', mimeType: 'image/jpeg', buffer: jpeg });
	expect(ok.status()).toBe(201);
	const { photo } = await ok.json();
	const other = await browser.newPage({ baseURL: base });
	await signIn(other, AIKO);
	// (The build is a draft: to another maker it does not exist, so 404, never a tell-tale 403.)
	expect((await post(other, { name: 'ok.jpg', mimeType: 'image/jpeg', buffer: jpeg })).status()).toBe(404);
	const del = await other.request.delete(`${url}/${photo.id}`, { headers: { origin: base } });
	expect(del.status()).toBe(404);
	// Nor may they fetch the draft's photo by its address.
	expect((await other.request.get(`${base}/media/photos/${photo.id}/320.webp`)).status()).toBe(404);
	await other.close();

	// Signed out: 401.
	const anon = await browser.newContext({ baseURL: base });
	const res = await anon.request.post(url, {
		headers: { accept: 'application/json', origin: base },
		multipart: { file: { name: 'ok.jpg', mimeType: 'image/jpeg', buffer: jpeg }, alt: 'x', purpose: 'cover' }
	});
	expect(res.status()).toBe(401);
	await anon.close();

	// The maker deletes it: the stored renditions are gone too.
	expect((await page.request.get(`${base}/media/photos/${photo.id}/320.webp`)).status()).toBe(200);
	const gone = await page.request.delete(`${url}/${photo.id}`, { headers: { origin: base } });
	expect(gone.status()).toBe(200);
	expect((await page.request.get(`${base}/media/photos/${photo.id}/320.webp`)).status()).toBe(404);
});
