import { json } from '@sveltejs/kit';
import { apiError, apiGuard, methodNotAllowed, readJson, zodErrorResponse } from '$lib/server/http';
import { fileReport } from '$lib/server/moderation';
import { reportSchema } from '$lib/schemas/review';
import type { RequestHandler } from './$types';
import { actorOf } from '$lib/server/actor';

/** Any member reports a build, a comment or a member: `{ targetKind, targetId, reason }`. → 201 { id } (200 with duplicate: true when already reported). */
export const POST: RequestHandler = ({ locals, request }) =>
	apiGuard(async () => {
		const actor = actorOf(locals.user);
		if (!actor) return apiError(401, 'unauthenticated', 'Sign in to report something.');
		const body = await readJson(request);
		if (!body.ok) return body.response;
		const parsed = reportSchema.safeParse(body.body);
		if (!parsed.success) return zodErrorResponse(parsed.error);
		const r = await fileReport(actor, parsed.data);
		return json({ id: r.id, duplicate: r.duplicate }, { status: r.duplicate ? 200 : 201 });
	}, 'targetId');

export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
