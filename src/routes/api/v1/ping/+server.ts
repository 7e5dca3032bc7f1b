import type { RequestHandler } from './$types';
import { methodNotAllowed } from '$lib/server/http';

/**
 * GET /api/v1/ping — a static string and nothing else: a liveness probe for load balancers, and the
 * baseline the benchmark measures every other route against (framework and hooks, no database).
 */
export const GET: RequestHandler = () =>
	new Response('ok', { headers: { 'content-type': 'text/plain; charset=utf-8', 'cache-control': 'no-store' } });

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['GET']);
