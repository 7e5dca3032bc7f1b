/**
 * Who may fetch a stored image, and how it may be cached. A photo is served only while its row
 * exists (a deleted photo's objects stop being served at once, whatever the store still holds); a
 * photo of a draft only to those who may see the draft, privately; a photo of a published or
 * archived build, or a member's current avatar, to everyone, cacheable for a year (keys never change content).
 */
import { and, eq } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import { canView } from '../builds/access';
import type { Viewer } from '../actor';

export const PUBLIC_CACHE = 'public, max-age=31536000, immutable';
/** Draft photos: the viewer's browser may keep them briefly; shared caches never. */
export const PRIVATE_CACHE = 'private, max-age=300';

const PHOTO_KEY = /^photos\/([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})\/[^/]+$/;
const AVATAR_KEY = /^avatars\/[^/]+\/[^/]+$/;

export type MediaAccess = { ok: true; cacheControl: string } | { ok: false };

/** Whether `viewer` may fetch the object at `key`, and the Cache-Control to send with it. */
export async function mediaAccess(key: string, viewer: Viewer): Promise<MediaAccess> {
	const photo = PHOTO_KEY.exec(key);
	if (photo) {
		const [row] = await db
			.select({ ownerId: schema.photo.ownerId, status: schema.build.status, buildOwner: schema.build.ownerId })
			.from(schema.photo)
			.leftJoin(schema.build, eq(schema.build.id, schema.photo.buildId))
			.where(eq(schema.photo.id, photo[1]))
			.limit(1);
		if (!row) return { ok: false };
		// A photo not (or no longer) attached to a build: only its uploader sees it.
		if (!row.status || !row.buildOwner) return viewer?.id === row.ownerId ? { ok: true, cacheControl: PRIVATE_CACHE } : { ok: false };
		const build = { ownerId: row.buildOwner, status: row.status };
		if (!canView(viewer, build)) return { ok: false };
		return { ok: true, cacheControl: row.status === 'draft' ? PRIVATE_CACHE : PUBLIC_CACHE };
	}
	if (AVATAR_KEY.test(key)) {
		const [u] = await db.select({ id: schema.user.id }).from(schema.user).where(and(eq(schema.user.avatarKey, key))).limit(1);
		return u ? { ok: true, cacheControl: PUBLIC_CACHE } : { ok: false };
	}
	return { ok: false };
}
