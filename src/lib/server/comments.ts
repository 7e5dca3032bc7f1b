/**
 * Comments on builds (PRODUCT.md §4.6): Markdown, sanitized on save, threaded one level deep (a reply
 * answers a top-level comment). Authors edit within 15 minutes and delete their own; nobody comments on
 * a locked build; moderators hide and restore (moderation.ts). Readers never see hidden comments.
 */
import { error } from '@sveltejs/kit';
import { and, asc, eq, gt, sql } from 'drizzle-orm';
import { env } from '$env/dynamic/private';
import * as schema from './db/schema';
import { db } from './db';
import { inTx } from './db/tx';
import { renderMarkdown } from './markdown';
import { notifyComment } from './notifications';
import { roleAtLeast } from '$lib/roles';
import { commentEditSchema, commentSchema } from '$lib/schemas/review';
import { EDIT_WINDOW_MS, type CommentItem } from '$lib/comments';
import { isUuid } from '$lib/uuid';
import type { Actor, Viewer } from './actor';
import { requireVisibleBuild } from './builds/queries';

export { EDIT_WINDOW_MS, type CommentItem };


type BuildRef = Pick<schema.Build, 'id' | 'slug' | 'title' | 'status' | 'locked' | 'ownerId'>;


/**
 * All comments of a build as a tree (top-level oldest first, replies oldest first). Hidden comments are
 * left out (with their replies) unless the viewer is a moderator; a deleted comment stays only as a
 * placeholder while it has visible replies.
 */
export async function listComments(buildId: string, viewer: Viewer): Promise<CommentItem[]> {
	const rows = await db
		.select({
			c: schema.comment,
			name: schema.user.name,
			handle: schema.user.handle
		})
		.from(schema.comment)
		.innerJoin(schema.user, eq(schema.user.id, schema.comment.authorId))
		.where(eq(schema.comment.buildId, buildId))
		.orderBy(asc(schema.comment.createdAt), asc(schema.comment.id))
		.limit(2000);
	const moderator = roleAtLeast(viewer?.role, 'moderator');
	const now = Date.now();

	const toItem = (r: (typeof rows)[number]): CommentItem | null => {
		const c = r.c;
		if (c.hidden && !moderator) return null;
		const mine = !!viewer && viewer.id === c.authorId;
		if (c.deletedAt) {
			return { id: c.id, author: null, bodyHtml: '', createdAt: c.createdAt.toISOString(), editedAt: null, parentId: c.parentId, replies: [], deleted: true };
		}
		const item: CommentItem = {
			id: c.id,
			author: { name: r.name, handle: r.handle },
			bodyHtml: c.bodyHtml,
			createdAt: c.createdAt.toISOString(),
			editedAt: c.editedAt?.toISOString() ?? null,
			parentId: c.parentId,
			replies: []
		};
		if (c.hidden) {
			item.hidden = true;
			item.hiddenReason = c.hiddenReason;
		}
		if (mine) {
			item.mine = true;
			item.bodyMd = c.bodyMd;
			const until = c.createdAt.getTime() + EDIT_WINDOW_MS;
			if (until > now) item.editableUntil = new Date(until).toISOString();
		}
		return item;
	};

	const top: CommentItem[] = [];
	const byId = new Map<string, CommentItem>();
	for (const r of rows) {
		if (r.c.parentId) continue;
		const item = toItem(r);
		if (!item) continue;
		byId.set(item.id, item);
		top.push(item);
	}
	for (const r of rows) {
		if (!r.c.parentId) continue;
		const parent = byId.get(r.c.parentId);
		if (!parent) continue;
		const item = toItem(r);
		if (item && !item.deleted) parent.replies.push(item);
	}
	return top.filter((t) => !t.deleted || t.replies.length > 0);
}

/** The build with this slug for comment routes: 404 unless it exists and `viewer` may see it (drafts: maker and admins). */
export async function requireCommentableBuild(slug: string, viewer: Viewer): Promise<BuildRef> {
	return requireVisibleBuild(slug, viewer);
}

function limitPerMinute(): number {
	return Number(env.COMMENT_RATE_PER_MIN ?? 6);
}
function limitPerHour(): number {
	return Number(env.COMMENT_RATE_PER_HOUR ?? 60);
}

/**
 * Refuse (429) when the member posted too often: by default 6 comments a minute, 60 an hour. Counted
 * from the comment table itself, so every app process sees the same numbers.
 */
async function assertRate(authorId: string): Promise<void> {
	const [{ minute, hour }] = await db
		.select({
			minute: sql<number>`count(*) filter (where ${schema.comment.createdAt} > now() - interval '1 minute')::int`,
			hour: sql<number>`count(*)::int`
		})
		.from(schema.comment)
		.where(and(eq(schema.comment.authorId, authorId), gt(schema.comment.createdAt, sql`now() - interval '1 hour'`)));
	if (minute >= limitPerMinute() || hour >= limitPerHour()) {
		error(429, 'You are commenting faster than we allow. Wait a minute and try again; your text is kept.');
	}
}

function assertOpen(b: BuildRef): void {
	if (b.locked) error(403, 'A moderator has locked this build: comments are closed for now.');
	if (b.status !== 'published') error(403, 'Comments open once the build is published.');
}

/**
 * Post a comment or a reply (to a top-level comment of the same build). Mail (notifyComment): the parent's
 * author (reply mail), the build's maker and its watchers (comment mail), one each, never the commenter.
 * → the new comment as the API shows it.
 */
export async function postComment(
	actor: Actor,
	build: BuildRef,
	input: { body: string; parentId?: string | null }
): Promise<CommentItem> {
	const data = commentSchema.parse(input);
	assertOpen(build);
	let parent: { id: string; authorId: string } | null = null;
	if (data.parentId) {
		const [p] = await db
			.select({ id: schema.comment.id, authorId: schema.comment.authorId, parentId: schema.comment.parentId, buildId: schema.comment.buildId, hidden: schema.comment.hidden, deletedAt: schema.comment.deletedAt })
			.from(schema.comment)
			.where(eq(schema.comment.id, data.parentId));
		if (!p || p.buildId !== build.id || p.parentId || p.hidden || p.deletedAt) {
			error(422, 'You can only reply to a top-level comment of this build.');
		}
		parent = p;
	}
	await assertRate(actor.id);
	const bodyHtml = renderMarkdown(data.body);
	// Read before the write: once the comment is committed nothing may fail the request (a 5xx would free its
	// Idempotency-Key and a retry would post it twice); the mail below never throws (notifyOnce).
	const [me] = await db.select({ name: schema.user.name, handle: schema.user.handle }).from(schema.user).where(eq(schema.user.id, actor.id));
	// In a transaction of its own: an API request's Idempotency-Key is marked "written" in it (db/tx.ts inTx),
	// so a retry can never post the comment twice, even when the answer could not be kept.
	const [row] = await inTx(undefined, (tx) =>
		tx
			.insert(schema.comment)
			.values({ buildId: build.id, authorId: actor.id, parentId: parent?.id ?? null, bodyMd: data.body, bodyHtml })
			.returning()
	);
	await notifyComment({
		actorId: actor.id,
		ownerId: build.ownerId,
		parentAuthorId: parent?.authorId ?? null,
		commenterName: me?.name ?? 'A member',
		build,
		commentId: row.id,
		bodyMd: data.body
	});
	return {
		id: row.id,
		author: { name: me?.name ?? '', handle: me?.handle ?? null },
		bodyHtml: row.bodyHtml,
		createdAt: row.createdAt.toISOString(),
		editedAt: null,
		parentId: row.parentId,
		replies: [],
		mine: true,
		bodyMd: row.bodyMd,
		editableUntil: new Date(row.createdAt.getTime() + EDIT_WINDOW_MS).toISOString()
	};
}

async function ownComment(actor: Actor, build: BuildRef, commentId: string) {
	if (!isUuid(commentId)) error(404, 'Not found');
	const [c] = await db
		.select()
		.from(schema.comment)
		.where(and(eq(schema.comment.id, commentId), eq(schema.comment.buildId, build.id)));
	if (!c || c.deletedAt || (c.hidden && !roleAtLeast(actor.role, 'moderator'))) error(404, 'Not found');
	if (c.authorId !== actor.id) error(403, 'Only its author can change or delete a comment.');
	return c;
}

/** The author edits a comment within 15 minutes of posting it (not on a locked build, not once hidden). */
export async function editComment(actor: Actor, build: BuildRef, commentId: string, body: string): Promise<CommentItem> {
	const data = commentEditSchema.parse({ body });
	const c = await ownComment(actor, build, commentId);
	if (build.locked) error(403, 'A moderator has locked this build: comments are closed for now.');
	if (c.hidden) error(403, 'A moderator hid this comment; it cannot be edited.');
	if (Date.now() - c.createdAt.getTime() > EDIT_WINDOW_MS) error(403, 'Comments can be edited for 15 minutes after posting.');
	const bodyHtml = renderMarkdown(data.body);
	const [row] = await db
		.update(schema.comment)
		.set({ bodyMd: data.body, bodyHtml, editedAt: new Date() })
		.where(eq(schema.comment.id, c.id))
		.returning();
	const [me] = await db.select({ name: schema.user.name, handle: schema.user.handle }).from(schema.user).where(eq(schema.user.id, actor.id));
	return {
		id: row.id,
		author: { name: me?.name ?? '', handle: me?.handle ?? null },
		bodyHtml: row.bodyHtml,
		createdAt: row.createdAt.toISOString(),
		editedAt: row.editedAt?.toISOString() ?? null,
		parentId: row.parentId,
		replies: [],
		mine: true,
		bodyMd: row.bodyMd,
		editableUntil: new Date(row.createdAt.getTime() + EDIT_WINDOW_MS).toISOString()
	};
}

/** The author deletes their comment (kept as a placeholder while it has replies). */
export async function deleteComment(actor: Actor, build: BuildRef, commentId: string): Promise<void> {
	const c = await ownComment(actor, build, commentId);
	await db.update(schema.comment).set({ deletedAt: new Date(), bodyMd: '', bodyHtml: '' }).where(eq(schema.comment.id, c.id));
}
