// Integration-test helpers for photos: a throwaway member with a draft build, and test images made with sharp.
import sharp from 'sharp';
import { eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { createTestUser } from './builds';

const tag = () => `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 7)}`;

/** A fresh maker with one draft build (and one step). Unique e-mail, handle and slug. */
export async function createMakerWithBuild(opts: { locked?: boolean } = {}) {
	const t = tag();
	const { id: userId } = await createTestUser('maker', 'Photo Tester');
	const [b] = await db
		.insert(schema.build)
		.values({
			slug: `photo-test-${t}`,
			ownerId: userId,
			title: 'Photo test build',
			category: 'power-amp',
			topology: 'class-ab-chip',
			locked: opts.locked ?? false
		})
		.returning();
	const [step] = await db
		.insert(schema.buildStep)
		.values({ buildId: b.id, position: 0, title: 'Fit the heatsink' })
		.returning();
	return { userId, build: b, step };
}

/** Remove what createMakerWithBuild made (the build, steps and photo rows cascade). */
export async function removeMaker(userId: string): Promise<void> {
	await db.delete(schema.user).where(eq(schema.user.id, userId));
}

/**
 * A JPEG `width`×`height` px as stored, tagged with EXIF orientation 6 (shown rotated 90°
 * clockwise, so upright it is height×width) and a GPS position that must never reach storage.
 */
export async function jpegWithGpsAndOrientation(width = 1600, height = 900): Promise<Buffer> {
	const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}">
		<rect width="100%" height="100%" fill="#efe7d6"/>
		<rect x="0" y="0" width="${Math.round(width / 4)}" height="${height}" fill="#b0592b"/>
		<circle cx="${width / 2}" cy="${height / 2}" r="${Math.round(height / 4)}" fill="#1f1d1a"/></svg>`;
	return sharp(Buffer.from(svg))
		.jpeg({ quality: 85 })
		.withExif({
			IFD0: { Make: 'Invented Camera Works', Software: 'starground-test' },
			IFD3: {
				GPSLatitudeRef: 'N',
				GPSLatitude: '51/1 30/1 0/1',
				GPSLongitudeRef: 'W',
				GPSLongitude: '0/1 7/1 0/1'
			}
		})
		.withMetadata({ orientation: 6 })
		.toBuffer();
}

/** A blank PNG of width×height px: tiny on disk, huge once decoded (a "decompression bomb"). */
export async function blankPng(width: number, height: number): Promise<Buffer> {
	return sharp({ create: { width, height, channels: 3, background: '#ffffff' } })
		.png({ compressionLevel: 9 })
		.toBuffer();
}

/** Whether an EXIF block carries a GPS IFD pointer (tag 0x8825, either byte order). */
export function exifHasGps(exif: Buffer | undefined): boolean {
	if (!exif) return false;
	return exif.includes(Buffer.from([0x25, 0x88])) || exif.includes(Buffer.from([0x88, 0x25]));
}
