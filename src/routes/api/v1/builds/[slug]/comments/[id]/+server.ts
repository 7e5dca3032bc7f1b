import { json } from '@sveltejs/kit';
import { apiError, apiGuard, methodNotAllowed, readJson, zodErrorResponse } from '$lib/server/http';
import { deleteComment, editComment, requireCommentableBuild } from '$lib/server/comments';
import { commentEditSchema } from '$lib/schemas/review';
import type { RequestHandler } from './$types';
import { actorOf } from '$lib/server/actor';

/** The author edits their comment within 15 minutes: `{ body }`. */
export const PATCH: RequestHandler = ({ params, locals, request }) =>
	apiGuard(async () => {
		const actor = actorOf(locals.user);
		if (!actor) return apiError(401, 'unauthenticated', 'Sign in first.');
		const b = await requireCommentableBuild(params.slug, actor);
		const body = await readJson(request);
		if (!body.ok) return body.response;
		const parsed = commentEditSchema.safeParse(body.body);
		if (!parsed.success) return zodErrorResponse(parsed.error);
		return json(await editComment(actor, b, params.id, parsed.data.body));
	});

/** The author deletes their comment. */
export const DELETE: RequestHandler = ({ params, locals }) =>
	apiGuard(async () => {
		const actor = actorOf(locals.user);
		if (!actor) return apiError(401, 'unauthenticated', 'Sign in first.');
		const b = await requireCommentableBuild(params.slug, actor);
		await deleteComment(actor, b, params.id);
		return new Response(null, { status: 204 });
	});

export const fallback: RequestHandler = () => methodNotAllowed(['PATCH', 'DELETE']);
