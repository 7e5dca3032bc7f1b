import { json } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { methodNotAllowed } from '$lib/server/http';
import { listBench } from '$lib/server/bench';
import { serializeListItem } from '$lib/server/builds';
import type { RequestHandler } from './$types';

/** GET /api/v1/bench — the signed-in member's saved builds, most recently saved first: { items }. */
export const GET: RequestHandler = async () => {
	const user = requireUser();
	const rows = await listBench(user.id);
	return json({ items: rows.map(serializeListItem) });
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['GET']);
