import { decodeCursor, encodeCursor, listPublishedBuilds, toCardData } from '$lib/server/builds';
import type { PageServerLoad } from './$types';

const PAGE_SIZE = 24;

export const load: PageServerLoad = async ({ url }) => {
	const raw = url.searchParams.get('cursor');
	// A cursor we did not make (edited by hand, or stale format) starts again from the newest.
	const cursor = raw ? decodeCursor(raw) : null;
	const { rows, next } = await listPublishedBuilds({ limit: PAGE_SIZE, cursor });
	return {
		builds: rows.map(toCardData),
		nextCursor: next ? encodeCursor(next) : null,
		paged: !!cursor
	};
};
