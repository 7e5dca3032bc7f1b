import { json } from '@sveltejs/kit';
import { apiError, methodNotAllowed, readJson, zodErrorResponse } from '$lib/server/api';
import { apiGuard } from '$lib/server/api-http';
import { listComments, postComment, requireCommentableBuild } from '$lib/server/comments';
import { commentSchema } from '$lib/schemas/review';
import type { RequestHandler } from './$types';

/** The comments of a build as a tree; public for published builds (hidden comments only for moderators). */
export const GET: RequestHandler = ({ params, locals }) =>
	apiGuard(async () => {
		const b = await requireCommentableBuild(params.slug, locals.user);
		const items = await listComments(b.id, locals.user);
		return json({ items, locked: b.locked }, { headers: { 'cache-control': 'private, no-store' } });
	});

/** Post a comment or a reply: `{ body, parentId? }`. Needs sign-in; refused on locked builds; rate limited. */
export const POST: RequestHandler = ({ params, locals, request }) =>
	apiGuard(async () => {
		const user = locals.user;
		if (!user) return apiError(401, 'unauthenticated', 'Sign in to comment.');
		const b = await requireCommentableBuild(params.slug, user);
		const body = await readJson(request);
		if (!body.ok) return body.response;
		const parsed = commentSchema.safeParse(body.body);
		if (!parsed.success) return zodErrorResponse(parsed.error);
		const item = await postComment({ id: user.id, role: user.role as string, name: user.name }, b, parsed.data);
		return json(item, { status: 201 });
	}, 'parentId');

export const fallback: RequestHandler = () => methodNotAllowed(['GET', 'POST']);
