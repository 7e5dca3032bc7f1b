import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import sharp from 'sharp';
import { eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { getObjectBytes, listKeys } from './storage';
import {
	PhotoError,
	checkAlt,
	deletePhoto,
	deletePhotoObjectsForBuild,
	processAndStorePhoto,
	renderIllustration,
	renditionWidths,
	sniffImageFormat
} from './photos';
import { photoSrcset, photoUrl } from '$lib/media';
import {
	blankPng,
	createMakerWithBuild,
	exifHasGps,
	jpegWithGpsAndOrientation,
	removeMaker
} from '../testing/photos';

describe('sniffImageFormat (magic numbers, not names)', () => {
	it('recognises JPEG, PNG and WebP by their first bytes', async () => {
		const base = sharp({ create: { width: 4, height: 4, channels: 3, background: '#000' } });
		expect(sniffImageFormat(await base.clone().jpeg().toBuffer())).toBe('jpeg');
		expect(sniffImageFormat(await base.clone().png().toBuffer())).toBe('png');
		expect(sniffImageFormat(await base.clone().webp().toBuffer())).toBe('webp');
	});
	it('refuses text, empty input and a GIF, and spots HEIC containers', () => {
		expect(sniffImageFormat(Buffer.from('hello, this is not a photo'))).toBeNull();
		expect(sniffImageFormat(new Uint8Array())).toBeNull();
		expect(sniffImageFormat(Buffer.from('GIF89a\x01\x00\x01\x00'))).toBeNull();
		const heic = Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypheic'), Buffer.alloc(12)]);
		expect(sniffImageFormat(heic)).toBe('heic');
	});
});

describe('checkAlt / renditionWidths / URLs', () => {
	it('requires 1–300 characters of alt text after trimming', () => {
		expect(checkAlt('  Board with heatsinks  ')).toBe('Board with heatsinks');
		expect(() => checkAlt('   ')).toThrow(/alt text/);
		expect(() => checkAlt(undefined)).toThrow(PhotoError);
		expect(() => checkAlt('x'.repeat(301))).toThrow(/under 300 characters/);
		expect(checkAlt('x'.repeat(300))).toHaveLength(300);
	});
	it('never upscales: a narrow source keeps its own width as the largest rendition', () => {
		expect(renditionWidths(4000)).toEqual([320, 640, 1280]);
		expect(renditionWidths(1280)).toEqual([320, 640, 1280]);
		expect(renditionWidths(900)).toEqual([320, 640, 900]);
		expect(renditionWidths(200)).toEqual([200]);
	});
	it('builds /media URLs and a srcset, smallest first', () => {
		expect(photoUrl('photos/abc', 640)).toBe('/media/photos/abc/640.webp');
		expect(photoSrcset({ keyPrefix: 'photos/abc', widths: [640, 320] })).toBe(
			'/media/photos/abc/320.webp 320w, /media/photos/abc/640.webp 640w'
		);
	});
});

describe('processAndStorePhoto (PostgreSQL + S3)', () => {
	let maker: Awaited<ReturnType<typeof createMakerWithBuild>>;
	beforeAll(async () => {
		maker = await createMakerWithBuild();
	});
	afterAll(async () => {
		await deletePhotoObjectsForBuild(maker.build.id);
		await removeMaker(maker.userId);
	});

	const photoRows = () => db.select().from(schema.photo).where(eq(schema.photo.buildId, maker.build.id));

	it('stores a good JPEG upright, in three WebP widths, with no EXIF or GPS left', async () => {
		// 1600×900 as stored, EXIF orientation 6 → upright it is 900 wide, 1600 tall.
		const jpeg = await jpegWithGpsAndOrientation(1600, 900);
		const inMeta = await sharp(jpeg).metadata();
		expect(inMeta.orientation).toBe(6);
		expect(exifHasGps(inMeta.exif)).toBe(true);

		const row = await processAndStorePhoto({
			ownerId: maker.userId,
			buildId: maker.build.id,
			stepId: maker.step.id,
			bytes: jpeg,
			alt: 'Amplifier board on the bench'
		});
		expect(row.widths).toEqual([320, 640, 900]);
		expect([row.width, row.height]).toEqual([900, 1600]);
		expect(row.alt).toBe('Amplifier board on the bench');
		expect(row.keyPrefix).toBe(`photos/${row.id}`);
		expect(row.placeholder).toMatch(/^data:image\/webp;base64,/);
		expect(row.stepId).toBe(maker.step.id);

		const keys = (await listKeys(`${row.keyPrefix}/`)).sort();
		expect(keys).toEqual([`${row.keyPrefix}/320.webp`, `${row.keyPrefix}/640.webp`, `${row.keyPrefix}/900.webp`].sort());
		for (const w of row.widths) {
			const out = await getObjectBytes(`${row.keyPrefix}/${w}.webp`);
			const meta = await sharp(out!).metadata();
			expect(meta.format).toBe('webp');
			expect(meta.width).toBe(w);
			// Portrait after rotation: taller than wide, in the source's aspect ratio.
			expect(meta.height).toBe(Math.round((w * 1600) / 900));
			expect(meta.exif).toBeUndefined();
			expect(meta.orientation).toBeUndefined();
		}
		// The dark band on the stored image's left edge is at the top once rotated upright.
		const top = await getObjectBytes(`${row.keyPrefix}/320.webp`);
		const { data, info } = await sharp(top!).raw().toBuffer({ resolveWithObject: true });
		const px = (x: number, y: number) => data[(y * info.width + x) * info.channels];
		expect(px(160, 5)).toBeLessThan(px(160, info.height - 5));

		const saved = (await photoRows()).find((r) => r.id === row.id);
		expect(saved?.alt).toBe('Amplifier board on the bench');
	});

	async function expectRefusal(bytes: Uint8Array, status: number, message: RegExp) {
		const rowsBefore = (await photoRows()).length;
		const objectsBefore = await listKeys('photos/');
		const err = await processAndStorePhoto({
			ownerId: maker.userId,
			buildId: maker.build.id,
			bytes,
			alt: 'Something that should not be stored'
		}).then(
			() => null,
			(e: unknown) => e
		);
		expect(err).toBeInstanceOf(PhotoError);
		expect((err as PhotoError).status).toBe(status);
		expect((err as PhotoError).message).toMatch(message);
		expect((await photoRows()).length).toBe(rowsBefore);
		expect((await listKeys('photos/')).sort()).toEqual(objectsBefore.sort());
	}

	it('refuses text bytes (whatever the file was called) with 415, storing nothing', async () => {
		await expectRefusal(Buffer.from('This is a shopping list, saved as board.jpg\n'), 415, /not a JPEG, PNG or WebP/);
	});

	it('refuses a truncated JPEG with 422, storing nothing', async () => {
		const jpeg = await jpegWithGpsAndOrientation(1200, 800);
		await expectRefusal(jpeg.subarray(0, Math.floor(jpeg.length * 0.6)), 422, /damaged or incomplete/);
	});

	it('refuses a decompression bomb (small file, 48 megapixels) with 413 before decoding', async () => {
		const png = await blankPng(8000, 6000);
		expect(png.length).toBeLessThan(1024 * 1024);
		await expectRefusal(png, 413, /8000 × 6000 pixels.*limit is 40 megapixels/);
	});

	it('refuses an extreme strip (over 10:1) with 422 instead of failing later', async () => {
		await expectRefusal(await blankPng(6000, 400), 422, /6000 × 400 pixels, longer than 10:1/);
	});

	it('refuses a file over the byte limit with 413', async () => {
		const huge = Buffer.alloc(15 * 1024 * 1024 + 1);
		huge.set([0xff, 0xd8, 0xff, 0xe0]);
		await expectRefusal(huge, 413, /limit is 15 MB/);
	});

	it('refuses a step from another build and leaves nothing', async () => {
		const other = await createMakerWithBuild();
		try {
			const before = await listKeys('photos/');
			const err = await processAndStorePhoto({
				ownerId: maker.userId,
				buildId: maker.build.id,
				stepId: other.step.id,
				bytes: await jpegWithGpsAndOrientation(400, 300),
				alt: 'Wrong step'
			}).catch((e: unknown) => e);
			expect((err as PhotoError).status).toBe(404);
			expect((await listKeys('photos/')).sort()).toEqual(before.sort());
		} finally {
			await removeMaker(other.userId);
		}
	});

	it('deletes the uploaded objects again when the row insert fails', async () => {
		const before = await listKeys('photos/');
		// A build id that does not exist: the objects go up, then the insert breaks its foreign key.
		const err = await processAndStorePhoto({
			ownerId: maker.userId,
			buildId: crypto.randomUUID(),
			bytes: await jpegWithGpsAndOrientation(400, 300),
			alt: 'Orphan candidate'
		}).catch((e: unknown) => e);
		expect(err).toBeInstanceOf(Error);
		expect(err).not.toBeInstanceOf(PhotoError);
		expect((await listKeys('photos/')).sort()).toEqual(before.sort());
	});

	it('a new cover replaces the old one (row and objects); deletePhoto clears the cover', async () => {
		const first = await processAndStorePhoto({
			ownerId: maker.userId,
			buildId: maker.build.id,
			bytes: await renderIllustration('<svg xmlns="http://www.w3.org/2000/svg" width="700" height="400"><rect width="700" height="400" fill="#3d5a80"/></svg>'),
			alt: 'First cover',
			asCover: true
		});
		const coverOf = async () =>
			(await db.select().from(schema.build).where(eq(schema.build.id, maker.build.id)))[0].coverPhotoId;
		expect(await coverOf()).toBe(first.id);
		expect(first.widths).toEqual([320, 640, 700]);

		const second = await processAndStorePhoto({
			ownerId: maker.userId,
			buildId: maker.build.id,
			bytes: await blankPng(500, 500),
			alt: 'Second cover',
			asCover: true
		});
		expect(await coverOf()).toBe(second.id);
		expect((await photoRows()).some((r) => r.id === first.id)).toBe(false);
		expect(await listKeys(`${first.keyPrefix}/`)).toEqual([]);
		expect((await listKeys(`${second.keyPrefix}/`)).length).toBe(2);

		const gone = await deletePhoto(second.id);
		expect(gone?.id).toBe(second.id);
		expect(await coverOf()).toBeNull();
		expect(await listKeys(`${second.keyPrefix}/`)).toEqual([]);
		expect(await deletePhoto(second.id)).toBeNull();
	});
});

describe('renderIllustration', () => {
	it('renders an SVG string to a JPEG of the same size', async () => {
		const jpeg = await renderIllustration(
			'<svg xmlns="http://www.w3.org/2000/svg" width="320" height="200"><circle cx="160" cy="100" r="60" fill="#b0592b"/></svg>'
		);
		expect(sniffImageFormat(jpeg)).toBe('jpeg');
		const meta = await sharp(jpeg).metadata();
		expect([meta.width, meta.height]).toEqual([320, 200]);
	});
});
