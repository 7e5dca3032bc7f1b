import { json } from '@sveltejs/kit';
import { apiError, apiGuard, methodNotAllowed, readJson, zodErrorResponse } from '$lib/server/http';
import { listBuiltIt, recordBuiltIt, removeBuiltIt, serializeBuiltIt } from '$lib/server/built-it';
import { requireVisibleBuild } from '$lib/server/builds';
import { builtItApiBody, apiFieldOf } from '$lib/schemas/built-it';
import { actorOf } from '$lib/server/actor';
import type { RequestHandler } from './$types';

/**
 * GET — who recorded "I built this too" for a build, oldest first: `{ items: [{ id, member, note, basedOn, photo,
 * figures, blocks: [{ kind, data, derived, checks }], recordedAt }], count }`. Anyone who may see the build.
 */
export const GET: RequestHandler = ({ params, locals }) =>
	apiGuard(async () => {
		const viewer = actorOf(locals.user);
		const b = await requireVisibleBuild(params.slug, viewer);
		const items = (await listBuiltIt(b.id, viewer)).map(serializeBuiltIt);
		return json({ items, count: items.length }, { headers: { 'cache-control': 'private, no-store' } });
	});

/**
 * POST — record (or replace) that you built it: `{ note?, basedOn?, currentLimited?, rails?: [{ expectedV, measuredV }],
 * dcOffsetMv?: [], thd?: [{ powerW, thdPct }], loadOhm? }`. 201 with the record when new, 200 when it replaced
 * yours; 400/422 with issue paths (a block's own checks included); 409 for your own or an unpublished build.
 */
export const POST: RequestHandler = ({ params, locals, request }) =>
	apiGuard(async () => {
		const actor = actorOf(locals.user);
		if (!actor) return apiError(401, 'unauthenticated', 'Sign in to record that you built it.');
		const body = await readJson(request);
		if (!body.ok) return body.response;
		const parsed = builtItApiBody.safeParse(body.body);
		if (!parsed.success) return zodErrorResponse(parsed.error);
		const r = await recordBuiltIt(actor, params.slug, parsed.data);
		if (!r.ok) {
			return apiError(
				422,
				'invalid',
				'Nothing was recorded: some figures do not pass their checks.',
				r.issues.map((i) => ({ path: apiFieldOf(i.path), message: i.message }))
			);
		}
		const b = await requireVisibleBuild(params.slug, actor);
		const item = (await listBuiltIt(b.id, actor)).find((x) => x.id === r.id)!;
		return json(serializeBuiltIt(item), { status: r.created ? 201 : 200 });
	});

/** DELETE — take your record (and its photo) off. 204, also when there was none. */
export const DELETE: RequestHandler = ({ params, locals }) =>
	apiGuard(async () => {
		const actor = actorOf(locals.user);
		if (!actor) return apiError(401, 'unauthenticated', 'Sign in first.');
		await removeBuiltIt(actor, params.slug);
		return new Response(null, { status: 204 });
	});

export const fallback: RequestHandler = () => methodNotAllowed(['GET', 'POST', 'DELETE']);
