import type { RequestHandler } from './$types';
import { apiError, methodNotAllowed } from '$lib/server/http';
import { canView, getBuildBySlug, loadPublishedContent, seesLiveContent } from '$lib/server/builds';
import { listPartLines, partsToCsv } from '$lib/server/parts';
import { actorOf } from '$lib/server/actor';

/**
 * GET /api/v1/builds/:slug/parts.csv — the parts list as RFC 4180 CSV (API.md). Published and archived
 * builds for everyone; a draft only for its maker (and admins); anything else is a 404 envelope, so a
 * draft's existence does not leak. Readers get the list as PUBLISHED (the latest revision), never the maker's
 * pending changes; the maker (and whoever may edit) gets the live list.
 */
export const GET: RequestHandler = async ({ params, locals }) => {
	const b = await getBuildBySlug(params.slug);
	const viewer = actorOf(locals.user);
	if (!b || !canView(viewer, b)) return apiError(404, 'not_found', 'No such build.');
	const published = seesLiveContent(viewer, b) ? null : await loadPublishedContent(b);
	const csv = partsToCsv(published ? published.content.parts : await listPartLines(b.id));
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${b.slug}-parts.csv"`,
			'cache-control': b.status === 'draft' || !published ? 'private, no-store' : 'no-cache'
		}
	});
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['GET']);
