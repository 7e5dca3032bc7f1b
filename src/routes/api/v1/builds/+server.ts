import { json } from '@sveltejs/kit';
import { apiError, zodErrorResponse } from '$lib/server/api';
import { decodeCursor, encodeCursor, listPublishedBuilds, listQuerySchema, serializeListItem } from '$lib/server/builds';
import type { RequestHandler } from './$types';

/** GET /api/v1/builds — published builds, newest first: { items, nextCursor }. */
export const GET: RequestHandler = async ({ url }) => {
	const parsed = listQuerySchema.safeParse(Object.fromEntries(url.searchParams));
	if (!parsed.success) return zodErrorResponse(parsed.error);
	let cursor = null;
	if (parsed.data.cursor !== undefined) {
		cursor = decodeCursor(parsed.data.cursor);
		if (!cursor) {
			return apiError(400, 'invalid', 'The cursor is not one this API gave out.', [
				{ path: 'cursor', message: 'pass nextCursor from a previous page unchanged' }
			]);
		}
	}
	const { rows, next } = await listPublishedBuilds({ limit: parsed.data.limit, cursor });
	return json(
		{ items: rows.map(serializeListItem), nextCursor: next ? encodeCursor(next) : null },
		{ headers: { 'cache-control': 'public, max-age=30' } }
	);
};
