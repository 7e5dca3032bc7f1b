import { error } from '@sveltejs/kit';
import { CATEGORIES } from '$lib/schemas/build';
import { atomResponse, buildsFeed } from '$lib/server/feed';
import type { RequestHandler } from './$types';

/** GET /categories/:category/feed.xml — Atom feed of newly published builds in one category. */
export const GET: RequestHandler = async ({ params, url }) => {
	if (!(CATEGORIES as readonly string[]).includes(params.category)) error(404, 'No such category');
	return atomResponse(await buildsFeed(url.origin, params.category));
};
