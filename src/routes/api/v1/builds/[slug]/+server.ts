import { json } from '@sveltejs/kit';
import { getBuildDetail } from '$lib/server/builds';
import type { RequestHandler } from './$types';
import { actorOf } from '$lib/server/actor';

/**
 * GET /api/v1/builds/:slug — the build with steps, spec blocks (derived values and checks), parts list,
 * review state and lineage. Drafts answer 404 except to their maker (and admins).
 */
export const GET: RequestHandler = async ({ params, locals }) => {
	const detail = await getBuildDetail(params.slug, actorOf(locals.user));
	const cache = detail.status === 'draft' ? 'private, no-store' : locals.user ? 'private, max-age=0' : 'public, max-age=30';
	return json(detail, { headers: { 'cache-control': cache } });
};
