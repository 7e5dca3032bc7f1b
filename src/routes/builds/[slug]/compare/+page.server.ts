import { error } from '@sveltejs/kit';
import { asc, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import * as schema from '$lib/server/db/schema';
import { canView, getMaker, requireVisibleBuild } from '$lib/server/builds';
import type { PageServerLoad } from './$types';
import { actorOf } from '$lib/server/actor';

/** A derived build's parts list beside its origin's. 404 when the build was not derived, or its origin is not visible. */
export const load: PageServerLoad = async ({ params, locals }) => {
	const viewer = actorOf(locals.user);
	const b = await requireVisibleBuild(params.slug, viewer);
	if (!b.derivedFromId) error(404, 'This build was not started from another, so there is nothing to compare.');
	const [origin] = await db.select().from(schema.build).where(eq(schema.build.id, b.derivedFromId));
	if (!origin || !canView(viewer, origin)) error(404, 'The build this one is based on is no longer available.');
	const parts = (buildId: string) =>
		db.select().from(schema.partLine).where(eq(schema.partLine.buildId, buildId)).orderBy(asc(schema.partLine.position));
	const [mine, theirs, originMaker] = await Promise.all([parts(b.id), parts(origin.id), getMaker(origin.ownerId)]);
	return {
		build: { slug: b.slug, title: b.title },
		origin: { slug: origin.slug, title: origin.title, makerName: originMaker.name },
		mine,
		theirs
	};
};
