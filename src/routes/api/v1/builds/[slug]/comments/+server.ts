import { json } from '@sveltejs/kit';
import { apiError, apiGuard, methodNotAllowed, readJson, zodErrorResponse } from '$lib/server/http';
import { listComments, postComment, requireCommentableBuild } from '$lib/server/comments';
import { commentSchema } from '$lib/schemas/review';
import type { RequestHandler } from './$types';
import { actorOf } from '$lib/server/actor';

/** The comments of a build as a tree; public for published builds (hidden comments only for moderators). */
export const GET: RequestHandler = ({ params, locals }) =>
	apiGuard(async () => {
		const viewer = actorOf(locals.user);
		const b = await requireCommentableBuild(params.slug, viewer);
		const items = await listComments(b.id, viewer);
		return json({ items, locked: b.locked }, { headers: { 'cache-control': 'private, no-store' } });
	});

/** Post a comment or a reply: `{ body, parentId? }`. Needs sign-in; refused on locked builds; rate limited. */
export const POST: RequestHandler = ({ params, locals, request }) =>
	apiGuard(async () => {
		const actor = actorOf(locals.user);
		if (!actor) return apiError(401, 'unauthenticated', 'Sign in to comment.');
		const b = await requireCommentableBuild(params.slug, actor);
		const body = await readJson(request);
		if (!body.ok) return body.response;
		const parsed = commentSchema.safeParse(body.body);
		if (!parsed.success) return zodErrorResponse(parsed.error);
		const item = await postComment(actor, b, parsed.data);
		return json(item, { status: 201 });
	}, 'parentId');

export const fallback: RequestHandler = () => methodNotAllowed(['GET', 'POST']);
