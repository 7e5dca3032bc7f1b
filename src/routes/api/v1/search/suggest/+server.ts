import { json } from '@sveltejs/kit';
import { methodNotAllowed, queryObject, zodErrorResponse } from '$lib/server/http';
import { suggestTitles } from '$lib/server/search';
import { suggestQuery } from '$lib/schemas/search';
import type { RequestHandler } from './$types';

/**
 * GET /api/v1/search/suggest?q=&limit= — titles of published builds matching what has been typed so far
 * (every word, the last as a prefix): { items: [{ slug, title, url }] }. An empty q gives no items.
 */
export const GET: RequestHandler = async ({ url }) => {
	const parsed = suggestQuery.safeParse(queryObject(url));
	if (!parsed.success) return zodErrorResponse(parsed.error);
	const rows = await suggestTitles(parsed.data.q, parsed.data.limit);
	return json({ items: rows.map((r) => ({ slug: r.slug, title: r.title, url: `/builds/${r.slug}` })) });
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['GET']);
