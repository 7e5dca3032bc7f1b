import { describe, it, expect, afterAll } from 'vitest';
import sharp from 'sharp';
import { eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { setAvatar, removeAvatar } from './profile';
import { getObjectBytes } from '../photos';
import { createTestUser, removeTestUsers } from '../testing/builds';
import { jpegWithGpsAndOrientation, exifHasGps } from '../testing/photos';

const keyOf = async (id: string) =>
	(await db.select({ k: schema.user.avatarKey }).from(schema.user).where(eq(schema.user.id, id)))[0]?.k ?? null;

describe('avatar', () => {
	const made: string[] = [];
	afterAll(() => removeTestUsers(made));

	it('stores a stripped WebP, replaces the previous one and removes it on request', async () => {
		const u = await createTestUser('maker', 'Avatar Tester');
		made.push(u.id);
		const first = await setAvatar(u.id, await jpegWithGpsAndOrientation(800, 600));
		expect(first).toMatch(/^avatars\/[0-9a-f-]+\/320\.webp$/);
		const bytes = await getObjectBytes(first);
		const meta = await sharp(bytes!).metadata();
		expect(meta.format).toBe('webp');
		expect(exifHasGps(meta.exif)).toBe(false);

		const second = await setAvatar(u.id, await jpegWithGpsAndOrientation(400, 400));
		expect(second).not.toBe(first);
		expect(await keyOf(u.id)).toBe(second);
		expect(await getObjectBytes(first)).toBeNull();

		await removeAvatar(u.id);
		expect(await keyOf(u.id)).toBeNull();
		expect(await getObjectBytes(second)).toBeNull();
	});

	it('refuses bytes that are not an image and keeps the old avatar', async () => {
		const u = await createTestUser('maker', 'Avatar Tester');
		made.push(u.id);
		const key = await setAvatar(u.id, await jpegWithGpsAndOrientation(300, 300));
		await expect(setAvatar(u.id, new TextEncoder().encode('not a picture at all, just text'))).rejects.toMatchObject({ status: 415 });
		expect(await keyOf(u.id)).toBe(key);
	});
});
