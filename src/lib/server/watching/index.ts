/**
 * Watching a build (PRODUCT.md §3, §4.5–4.6): a member who watches a published build gets mail, like its maker,
 * when it gets a new comment, a new revision, a sign-off or send-back, or a hazard tag is tagged, fixed, cleared
 * or re-tagged (notifications.ts; each under its kind's opt-out). The maker does not watch their own build (they
 * get that mail already). Watching is member-only state: the anonymous reader cache never sees it.
 */
import { error } from '@sveltejs/kit';
import { and, eq, ne } from 'drizzle-orm';
import * as schema from '../db/schema';
import { db } from '../db';
import type { Actor } from '../actor';
import { getBuildBySlug } from '../builds/queries';
import { canView } from '../builds/access';

/** The build a member may start or stop watching: 404 when they cannot see it, 409 for their own or an unpublished one. */
async function watchable(actor: Actor, slug: string): Promise<schema.Build> {
	const b = await getBuildBySlug(slug);
	if (!b || !canView(actor, b)) error(404, 'Not found');
	if (b.ownerId === actor.id) error(409, 'This is your own build: you get its mail already.');
	return b;
}

/** Start watching the published build at `slug` (harmless when already watching). → true. */
export async function watchBuild(actor: Actor, slug: string): Promise<boolean> {
	const b = await watchable(actor, slug);
	if (b.status !== 'published') error(409, 'Only a published build can be watched.');
	await db.insert(schema.buildWatch).values({ buildId: b.id, userId: actor.id }).onConflictDoNothing();
	return true;
}

/** Stop watching the build at `slug` (harmless when not watching; works on an archived build too). → false. */
export async function unwatchBuild(actor: Actor, slug: string): Promise<boolean> {
	const b = await watchable(actor, slug);
	await db.delete(schema.buildWatch).where(and(eq(schema.buildWatch.buildId, b.id), eq(schema.buildWatch.userId, actor.id)));
	return false;
}

/** Whether `userId` watches `buildId`. */
export async function isWatching(userId: string, buildId: string): Promise<boolean> {
	const [row] = await db
		.select({ u: schema.buildWatch.userId })
		.from(schema.buildWatch)
		.where(and(eq(schema.buildWatch.buildId, buildId), eq(schema.buildWatch.userId, userId)));
	return !!row;
}

/**
 * The members watching `buildId` who may still see it, oldest watcher first: none while it is a draft again,
 * never its maker. (Opt-outs and suspensions are applied when the mail is queued.)
 */
export async function watcherIds(buildId: string): Promise<string[]> {
	const rows = await db
		.select({ id: schema.buildWatch.userId })
		.from(schema.buildWatch)
		.innerJoin(schema.build, eq(schema.build.id, schema.buildWatch.buildId))
		.where(and(eq(schema.buildWatch.buildId, buildId), ne(schema.build.status, 'draft'), ne(schema.buildWatch.userId, schema.build.ownerId)))
		.orderBy(schema.buildWatch.createdAt, schema.buildWatch.userId);
	return rows.map((r) => r.id);
}
