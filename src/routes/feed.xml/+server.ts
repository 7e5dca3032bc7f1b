import { error } from '@sveltejs/kit';
import { CATEGORIES } from '$lib/schemas/build';
import { atomResponse, buildsFeed } from '$lib/server/feed';
import type { RequestHandler } from './$types';

/** GET /feed.xml — Atom feed of newly published builds; `?category=power-amp` narrows it to one category. */
export const GET: RequestHandler = async ({ url }) => {
	const category = url.searchParams.get('category') || undefined;
	if (category && !(CATEGORIES as readonly string[]).includes(category)) error(404, 'No such category');
	return atomResponse(await buildsFeed(url.origin, category));
};
