/**
 * A member's bench: the builds they saved to come back to (PRODUCT.md §3, §4.8). Only builds readers
 * can see go on a bench (published, or archived after saving); saving twice or removing twice is harmless.
 */
import { and, desc, eq, inArray, ne } from 'drizzle-orm';
import { error } from '@sveltejs/kit';
import { db } from './db';
import * as schema from './db/schema';
import { getBuildBySlug } from './builds/queries';
import { selectBuildList } from './builds/list';

/** Most builds one bench lists (a bench is a short list; beyond this the oldest saves drop off the page). */
export const BENCH_LIST_MAX = 500;

/** Whether `userId` has the build on their bench. */
export async function isOnBench(userId: string, buildId: string): Promise<boolean> {
	const [row] = await db
		.select({ buildId: schema.benchItem.buildId })
		.from(schema.benchItem)
		.where(and(eq(schema.benchItem.userId, userId), eq(schema.benchItem.buildId, buildId)));
	return !!row;
}

/** Which of `buildIds` are on the member's bench (one query for a whole list). */
export async function benchedIds(userId: string, buildIds: string[]): Promise<Set<string>> {
	if (buildIds.length === 0) return new Set();
	const rows = await db
		.select({ buildId: schema.benchItem.buildId })
		.from(schema.benchItem)
		.where(and(eq(schema.benchItem.userId, userId), inArray(schema.benchItem.buildId, buildIds)));
	return new Set(rows.map((r) => r.buildId));
}

/**
 * Put a build on the member's bench (`saved = true`) or take it off. 404 for a build readers cannot see;
 * 409 for a draft (only published builds can be saved). → the build's new state.
 */
export async function setOnBench(userId: string, slug: string, saved: boolean): Promise<{ slug: string; saved: boolean }> {
	const b = await getBuildBySlug(slug);
	if (!b || (b.status === 'draft' && b.ownerId !== userId)) error(404, 'Not found');
	if (saved) {
		if (b.status !== 'published') error(409, 'Only published builds can be saved to a bench.');
		await db.insert(schema.benchItem).values({ userId, buildId: b.id }).onConflictDoNothing();
	} else {
		await db.delete(schema.benchItem).where(and(eq(schema.benchItem.userId, userId), eq(schema.benchItem.buildId, b.id)));
	}
	return { slug: b.slug, saved };
}

/** The member's bench, most recently saved first: list rows (published and archived builds) with when each was saved. */
export async function listBench(userId: string) {
	const rows = await selectBuildList()
		.innerJoin(schema.benchItem, and(eq(schema.benchItem.buildId, schema.build.id), eq(schema.benchItem.userId, userId)))
		.where(ne(schema.build.status, 'draft'))
		.orderBy(desc(schema.benchItem.createdAt), desc(schema.build.id))
		.limit(BENCH_LIST_MAX);
	return rows;
}
