import { json } from '@sveltejs/kit';
import { apiError, methodNotAllowed, readJson, zodErrorResponse } from '$lib/server/api';
import { apiGuard } from '$lib/server/api-http';
import { deleteComment, editComment, requireCommentableBuild } from '$lib/server/comments';
import { commentEditSchema } from '$lib/schemas/review';
import type { RequestHandler } from './$types';

/** The author edits their comment within 15 minutes: `{ body }`. */
export const PATCH: RequestHandler = ({ params, locals, request }) =>
	apiGuard(async () => {
		const user = locals.user;
		if (!user) return apiError(401, 'unauthenticated', 'Sign in first.');
		const b = await requireCommentableBuild(params.slug, user);
		const body = await readJson(request);
		if (!body.ok) return body.response;
		const parsed = commentEditSchema.safeParse(body.body);
		if (!parsed.success) return zodErrorResponse(parsed.error);
		return json(await editComment({ id: user.id, role: user.role as string }, b, params.id, parsed.data.body));
	});

/** The author deletes their comment. */
export const DELETE: RequestHandler = ({ params, locals }) =>
	apiGuard(async () => {
		const user = locals.user;
		if (!user) return apiError(401, 'unauthenticated', 'Sign in first.');
		const b = await requireCommentableBuild(params.slug, user);
		await deleteComment({ id: user.id, role: user.role as string }, b, params.id);
		return new Response(null, { status: 204 });
	});

export const fallback: RequestHandler = () => methodNotAllowed(['PATCH', 'DELETE']);
