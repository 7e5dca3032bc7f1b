import { json } from '@sveltejs/kit';
import { apiError, methodNotAllowed, queryObject, zodErrorResponse } from '$lib/server/http';
import { encodeCursor, queryBuilds, serializeListItem } from '$lib/server/builds';
import { FIND_KEYS, listQuerySchema } from '$lib/schemas/list';
import { getReviewStates, reviewStateJson } from '$lib/server/reviews/state';
import { highlightBuilds } from '$lib/server/search';
import type { RequestHandler } from './$types';

/**
 * GET /api/v1/builds?q=&category=&topology=&review=&mains=&maker=&sort=&cursor=&limit= (+ the find figures railMinV=
 * &railMaxV=&loadOhm=&powerMinW=&powerMaxW=&partKind=&partValue=&partPackage=, builds/find-index.ts) — published builds,
 * one page at a time: { items, nextCursor }. With `q`: full-text search, ranked (sort `relevance` by
 * default), each item with `match.titleHtml` / `match.snippetHtml` (escaped; hits in <mark>).
 */
export const GET: RequestHandler = async ({ url }) => {
	const parsed = listQuerySchema.safeParse(queryObject(url));
	if (!parsed.success) {
		// The find figures (rails, load, power, part) answer 400 with their sentences, out of range or not.
		const find = parsed.error.issues.filter((i) => (FIND_KEYS as readonly PropertyKey[]).includes(i.path[0]!));
		if (find.length)
			return apiError(400, 'invalid', 'Some of the figures to find builds by cannot be used.', find.map((i) => ({ path: String(i.path[0]), message: i.message })));
		return zodErrorResponse(parsed.error);
	}
	const result = await queryBuilds(parsed.data);
	if (!result.ok) {
		return apiError(400, 'invalid', result.path === 'cursor' ? 'The cursor is not one this API gave out for this order.' : 'The request is malformed.', [
			{ path: result.path, message: result.message }
		]);
	}
	const ids = result.rows.map((r) => r.id);
	const [states, highlights] = await Promise.all([
		getReviewStates(ids),
		parsed.data.q ? highlightBuilds(ids, parsed.data.q) : Promise.resolve(null)
	]);
	const items = result.rows.map((r) => {
		const s = states.get(r.id);
		const h = highlights?.get(r.id);
		return {
			...serializeListItem(r),
			review: s ? reviewStateJson(s) : null,
			...(highlights ? { match: h ? { titleHtml: h.titleHtml, snippetHtml: h.snippetHtml } : null } : {})
		};
	});
	return json({ items, sort: result.sort, nextCursor: result.next ? encodeCursor(result.next) : null });
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['GET']);
