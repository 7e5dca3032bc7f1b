/** A derived build's parts list beside its origin's (the compare page). */
import { error } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db } from '../db';
import type { Viewer } from '../actor';
import { canView, getMaker, requireVisibleBuild } from '../builds';
import { listPartLines } from './index';

/**
 * The build at `slug` (404 unless `viewer` may see it) and the build it is based on, with both parts
 * lists in list order. 404 when the build was not derived, or its origin is no longer visible to `viewer`.
 */
export async function compareWithOrigin(slug: string, viewer: Viewer) {
	const b = await requireVisibleBuild(slug, viewer);
	if (!b.derivedFromId) error(404, 'This build is not based on another build, so there is nothing to compare.');
	const [origin] = await db.select().from(schema.build).where(eq(schema.build.id, b.derivedFromId));
	if (!origin || !canView(viewer, origin)) error(404, 'The build this one is based on is no longer available.');
	const [mine, theirs, originMaker] = await Promise.all([listPartLines(b.id), listPartLines(origin.id), getMaker(origin.ownerId)]);
	return { build: b, origin, originMaker, mine, theirs };
}
