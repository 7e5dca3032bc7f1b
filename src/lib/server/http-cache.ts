/**
 * HTTP caching of public reads: a weak ETag (hash of the body) on every cacheable 200, a 304 with no
 * body when the client's `If-None-Match` matches, and a `Cache-Control` policy per kind of route.
 */
import { createHash } from 'node:crypto';

/** Weak validator from the body bytes: W/"<27 chars of base64url SHA-1>". Same body → same tag. */
export function weakEtag(body: Uint8Array | string): string {
	return `W/"${createHash('sha1').update(body).digest('base64url').slice(0, 27)}"`;
}

/**
 * True when an `If-None-Match` header value names `etag` (weak comparison, RFC 9110 §13.1.2):
 * `W/"a"` matches `"a"` and `W/"a"`; `*` matches anything; lists are comma separated.
 */
export function etagMatches(ifNoneMatch: string | null, etag: string): boolean {
	if (!ifNoneMatch) return false;
	const bare = (t: string) => t.trim().replace(/^W\//, '');
	const want = bare(etag);
	return ifNoneMatch.split(',').some((t) => t.trim() === '*' || bare(t) === want);
}

const PUBLIC_SHORT = 'public, max-age=60, stale-while-revalidate=300';
const REVALIDATE = 'public, no-cache';
const PUBLIC_LONG = 'public, max-age=3600';

/**
 * The `Cache-Control` for a GET of `pathname`, or null when the route is not a cacheable read.
 * Signed-in viewers get `private, no-cache` (what they see can differ: their drafts, their bench);
 * comments always revalidate so that a reply shows at once; computations keep an hour.
 */
export function cachePolicy(pathname: string, signedIn: boolean): string | null {
	const api = pathname.startsWith('/api/v1/');
	const feed = pathname === '/feed.xml' || /^\/categories\/[^/]+\/feed\.xml$/.test(pathname) || pathname === '/sitemap.xml';
	if ((!api && !feed) || pathname === '/api/v1/ping') return null;
	if (signedIn || pathname.startsWith('/api/v1/bench')) return 'private, no-cache';
	if (/^\/api\/v1\/builds\/[^/]+\/comments$/.test(pathname)) return REVALIDATE;
	if (pathname.startsWith('/api/v1/tools/') || pathname === '/api/v1/openapi.json') return PUBLIC_LONG;
	return PUBLIC_SHORT;
}

/**
 * Give a 200 GET response its ETag and Cache-Control (unless the route set them) and answer 304
 * when the client already holds this body. Other responses pass through unchanged.
 */
export async function withValidators(request: Request, response: Response, policy: string): Promise<Response> {
	if (request.method !== 'GET' || response.status !== 200) return response;
	const body = new Uint8Array(await response.arrayBuffer());
	const headers = new Headers(response.headers);
	const etag = headers.get('etag') ?? weakEtag(body);
	headers.set('etag', etag);
	if (!headers.has('cache-control')) headers.set('cache-control', policy);
	const vary = headers.get('vary');
	if (!vary?.toLowerCase().includes('cookie')) headers.set('vary', vary ? `${vary}, Cookie` : 'Cookie');
	if (etagMatches(request.headers.get('if-none-match'), etag)) {
		headers.delete('content-length');
		return new Response(null, { status: 304, headers });
	}
	return new Response(body, { status: 200, headers });
}
