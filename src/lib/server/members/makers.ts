/**
 * Maker profiles (/makers/:handle): who they are, their published builds and, for reviewers, the
 * reviews they gave. Only public facts: no e-mail, no drafts.
 */
import { error } from '@sveltejs/kit';
import { and, count, desc, eq, ne } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';

/** Reviews listed on a profile. */
export const PROFILE_REVIEWS = 20;

/** '  Ada  de Vries ' → 'AV'; one word → its first letter; nothing → '?'. */
export function initials(name: string): string {
	const words = name.trim().split(/\s+/).filter(Boolean);
	if (words.length === 0) return '?';
	const first = [...words[0]][0] ?? '';
	const last = words.length > 1 ? ([...words[words.length - 1]][0] ?? '') : '';
	return (first + last).toUpperCase();
}

/** The member with this handle as readers see them, or 404. */
export async function getMakerProfile(handle: string) {
	const h = handle.trim().toLowerCase();
	if (!/^[a-z0-9][a-z0-9-]{0,39}$/.test(h)) error(404, 'Not found');
	const [u] = await db
		.select({
			id: schema.user.id,
			name: schema.user.name,
			handle: schema.user.handle,
			bio: schema.user.bio,
			role: schema.user.role,
			avatarKey: schema.user.avatarKey,
			createdAt: schema.user.createdAt
		})
		.from(schema.user)
		.where(eq(schema.user.handle, h));
	if (!u) error(404, 'Not found');
	const [[builds], [reviews]] = await Promise.all([
		db
			.select({ n: count() })
			.from(schema.build)
			.where(and(eq(schema.build.ownerId, u.id), eq(schema.build.status, 'published'))),
		db
			.select({ n: count() })
			.from(schema.review)
			.innerJoin(schema.build, eq(schema.build.id, schema.review.buildId))
			.where(and(eq(schema.review.reviewerId, u.id), ne(schema.build.status, 'draft')))
	]);
	return {
		...u,
		avatarUrl: u.avatarKey ? `/media/${u.avatarKey}` : null,
		initials: initials(u.name),
		publishedCount: builds?.n ?? 0,
		reviewCount: reviews?.n ?? 0
	};
}

/** The latest reviews a member gave on builds readers can see, newest first, with each build's current revision. */
export async function reviewsGivenBy(userId: string, limit = PROFILE_REVIEWS) {
	return db
		.select({
			id: schema.review.id,
			verdict: schema.review.verdict,
			revision: schema.review.revision,
			createdAt: schema.review.createdAt,
			summaryHtml: schema.review.summaryHtml,
			buildSlug: schema.build.slug,
			buildTitle: schema.build.title,
			buildRevision: schema.build.revision
		})
		.from(schema.review)
		.innerJoin(schema.build, eq(schema.build.id, schema.review.buildId))
		.where(and(eq(schema.review.reviewerId, userId), ne(schema.build.status, 'draft')))
		.orderBy(desc(schema.review.createdAt), desc(schema.review.id))
		.limit(limit);
}
