/**
 * The anonymous reader cache of the lists: the home page, browse (every filter and page), the search page
 * and the builds API list. What a visitor who is not signed in gets there is the same for everyone and
 * depends only on the URL and on published builds, so the answer is kept per URL together with the
 * site-wide reader version it was made at (./reader-version: database triggers move it in the transaction
 * of every write to a non-draft build, so it is exact across app instances). A request reads the version
 * (one small query shared by concurrent requests), answers 304 when the browser holds the same body
 * (ETag), serves the kept answer when it was made at this version, and otherwise lets the route answer
 * and keeps that — one render per URL and version, however many requests miss at once.
 *
 * Never kept: signed-in members' answers, data requests (`__data.json`), anything but a 200 without a
 * cookie, pages carrying a CSP nonce. Bounded in-process LRU (lru-cache): `LIST_CACHE_MB` (16 MB).
 */
import type { Handle, RequestEvent } from '@sveltejs/kit';
import { LRUCache } from 'lru-cache';
import { env } from '$env/dynamic/private';
import { etagMatches, weakEtag } from '../http-cache';
import { currentReaderVersion } from './reader-version';

/** The routes whose anonymous answers are kept: home, browse, search, the builds API list. */
export function isCachedList(pathname: string): boolean {
	return pathname === '/' || pathname === '/builds' || pathname === '/search' || pathname === '/api/v1/builds';
}

interface Kept {
	version: number;
	etag: string;
	body: Uint8Array;
	headers: [string, string][];
}

let kept: LRUCache<string, Kept> | null = null;
function store(): LRUCache<string, Kept> {
	const mb = Number(env.LIST_CACHE_MB);
	kept ??= new LRUCache<string, Kept>({
		max: 5000,
		maxSize: (Number.isFinite(mb) && mb > 0 ? mb : 16) * 1024 * 1024,
		sizeCalculation: (k) => Math.max(1, k.body.byteLength + 200)
	});
	return kept;
}

/** Renders in flight, by version and URL: requests that miss at the same time wait for one. */
const inflight = new Map<string, Promise<Kept | null>>();

/** Drop everything (tests; never needed for correctness). */
export function clearListCache(): void {
	kept?.clear();
}

/** How many answers are kept (tests). */
export function listCacheSize(): number {
	return kept?.size ?? 0;
}

/** Pages revalidate every time (a new build shows at once); the API keeps the policy its route set. */
const PAGE_CACHE_CONTROL = 'no-cache';

function answer(request: Request, k: Kept): Response {
	const headers = new Headers(k.headers);
	if (etagMatches(request.headers.get('if-none-match'), k.etag)) {
		headers.delete('content-length');
		return new Response(null, { status: 304, headers });
	}
	return new Response(k.body.slice(), { status: 200, headers });
}

/** What of `response` may be kept for `version`, or null. Consumes the body of a keepable response. */
async function keepable(response: Response, version: number, changedAt: Date): Promise<{ kept: Kept | null; response: Response }> {
	const type = response.headers.get('content-type') ?? '';
	const html = type.startsWith('text/html');
	if (response.status !== 200 || response.headers.has('set-cookie') || !(html || type.startsWith('application/json'))) return { kept: null, response };
	const body = new Uint8Array(await response.arrayBuffer());
	const headers = new Headers(response.headers);
	const etag = headers.get('etag') ?? weakEtag(body);
	headers.set('etag', etag);
	if (!headers.has('last-modified')) headers.set('last-modified', new Date(Math.floor(changedAt.getTime() / 1000) * 1000).toUTCString());
	if (html) {
		headers.set('cache-control', PAGE_CACHE_CONTROL);
		headers.set('vary', 'Cookie');
	}
	const out = new Response(body, { status: 200, headers });
	// A page with a per-request CSP nonce must never be served twice (kit.csp is in hash mode: none).
	if (html && new TextDecoder().decode(body).includes(' nonce=')) return { kept: null, response: out };
	return { kept: { version, etag, body, headers: [...headers] }, response: out };
}

export const handleListCache: Handle = async ({ event, resolve }) => {
	if (!cacheableRequest(event)) return resolve(event);
	const { version, changedAt } = await currentReaderVersion();
	const key = `${event.url.origin}${event.url.pathname}${event.url.search}`;
	const hit = store().get(key);
	if (hit && hit.version === version) return answer(event.request, hit);

	const flight = `${version}\n${key}`;
	const pending = inflight.get(flight);
	if (pending) {
		const k = await pending;
		return k ? answer(event.request, k) : resolve(event);
	}
	let settle: (k: Kept | null) => void = () => undefined;
	inflight.set(
		flight,
		new Promise<Kept | null>((r) => (settle = r))
	);
	let result: Kept | null = null;
	try {
		const kept = await keepable(await resolve(event), version, changedAt);
		result = kept.kept;
		if (!result) return kept.response;
		// Never replace an answer made at a later version by one made at an earlier one.
		const current = store().get(key);
		if (!current || current.version <= version) store().set(key, result);
		return answer(event.request, result);
	} finally {
		inflight.delete(flight);
		settle(result);
	}
};

function cacheableRequest(event: RequestEvent): boolean {
	return event.request.method === 'GET' && !event.isDataRequest && !event.locals.user && isCachedList(event.url.pathname);
}
