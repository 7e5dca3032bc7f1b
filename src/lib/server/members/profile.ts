/** A member's own profile settings: display name, bio and which notification mails they get. */
import { eq } from 'drizzle-orm';
import { error } from '@sveltejs/kit';
import { db } from '../db';
import * as schema from '../db/schema';
import { profileSchema } from '$lib/schemas/account';
import type { z } from 'zod';
import { PhotoError, processPhoto } from '../photos';
import { initials } from './makers';
import { putObject, deleteObjects } from '../photos';
import { deleteObjectsDurably } from '../photos/object-deletion';

export type ProfileSettings = z.infer<typeof profileSchema>;

/** The member's editable settings and the read-only facts shown next to them. */
export async function getProfileSettings(userId: string) {
	const [u] = await db.select().from(schema.user).where(eq(schema.user.id, userId));
	if (!u) error(404, 'Not found');
	return {
		form: { name: u.name, bio: u.bio, notifyReview: u.notifyReview, notifyFlag: u.notifyFlag, notifyReply: u.notifyReply, notifyComment: u.notifyComment, notifyRevision: u.notifyRevision } satisfies ProfileSettings,
		account: { email: u.email, handle: u.handle, role: u.role, createdAt: u.createdAt, name: u.name, initials: initials(u.name), avatarUrl: u.avatarKey ? `/media/${u.avatarKey}` : null }
	};
}

/** Save the member's settings (validated again here: the one place that writes them). */
export async function saveProfileSettings(userId: string, input: ProfileSettings): Promise<void> {
	const data = profileSchema.parse(input);
	await db
		.update(schema.user)
		.set({ name: data.name, bio: data.bio, notifyReview: data.notifyReview, notifyFlag: data.notifyFlag, notifyReply: data.notifyReply, notifyComment: data.notifyComment, notifyRevision: data.notifyRevision })
		.where(eq(schema.user.id, userId));
}

/** Width of the stored avatar rendition (shown at up to 96 px, sharp on dense screens). */
const AVATAR_WIDTH = 320;

/**
 * Replace a member's avatar: the upload goes through the photo pipeline (checked by its bytes,
 * size and pixel limits, auto-rotated, metadata stripped), one square-ish WebP is stored under
 * `avatars/`, and the previous one is removed. If the row update fails, the new object is removed.
 * Throws PhotoError (415/413/422) for a bad upload.
 */
export async function setAvatar(userId: string, bytes: Uint8Array): Promise<string> {
	const processed = await processPhoto(bytes);
	const rendition = processed.renditions.find((r) => r.width === Math.min(AVATAR_WIDTH, processed.width)) ?? processed.renditions[0];
	const key = `avatars/${crypto.randomUUID()}/${rendition.width}.webp`;
	try {
		await putObject(key, rendition.data, { contentType: 'image/webp', cacheControl: 'public, max-age=31536000, immutable' });
	} catch (err) {
		console.error('avatar: storing failed', err);
		throw new PhotoError(503, 'unavailable', 'Photo storage is not answering right now, so the picture was not saved. Try again in a minute.');
	}
	let previous: string | null = null;
	try {
		const [u] = await db.select({ avatarKey: schema.user.avatarKey }).from(schema.user).where(eq(schema.user.id, userId));
		previous = u?.avatarKey ?? null;
		await db.update(schema.user).set({ avatarKey: key }).where(eq(schema.user.id, userId));
	} catch (err) {
		await deleteObjects([key]).catch(() => {});
		throw err;
	}
	if (previous) await deleteObjectsDurably([previous]);
	return key;
}

/** Remove a member's avatar (row first, then the object). */
export async function removeAvatar(userId: string): Promise<void> {
	const [u] = await db.select({ avatarKey: schema.user.avatarKey }).from(schema.user).where(eq(schema.user.id, userId));
	if (!u?.avatarKey) return;
	await db.update(schema.user).set({ avatarKey: null }).where(eq(schema.user.id, userId));
	await deleteObjectsDurably([u.avatarKey]);
}
