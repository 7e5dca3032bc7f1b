/**
 * The anonymous reader cache of build pages. What a visitor who is not signed in gets for a published (or
 * archived) build is the same for everyone, so its page data is computed once per version and kept in a
 * bounded in-process LRU (lru-cache), and the page answers conditional requests (ETag, Last-Modified → 304).
 *
 * Correct across app instances: the key is the build id plus `build.view_version`, which database
 * triggers (migration 0004) bump in the same transaction as every write that changes the reader's view
 * (the build row, steps, photos, spec blocks, parts, revisions, reviews, hazard tags, comments, lineage,
 * members' names). Each request reads that version with the build row (one indexed query it makes
 * anyway), so an instance never serves a version another instance has already replaced. Signed-in
 * members, drafts and URLs with a query string are never cached.
 */
import type { Handle } from '@sveltejs/kit';
import { createHash } from 'node:crypto';
import { LRUCache } from 'lru-cache';
import { env } from '$env/dynamic/private';
import { version } from '$app/environment';
import type { Build } from '../db/schema';
import { getBuildBySlug, getBuildHead } from './queries';
import { currentReaderVersion } from './reader-version';
import { etagMatches } from '../http-cache';

function positive(v: string | undefined, fallback: number): number {
	const n = Number(v);
	return Number.isFinite(n) && n > 0 ? Math.floor(n) : fallback;
}

type PageData = Record<string, unknown>;
type Compute = () => Promise<PageData>;

let cache: LRUCache<string, PageData, Compute> | null = null;

/** The cache (made on first use, so `READER_CACHE_MAX` / `READER_CACHE_MB` are read from the environment). */
function readerCache(): LRUCache<string, PageData, Compute> {
	cache ??= new LRUCache<string, PageData, Compute>({
		max: positive(env.READER_CACHE_MAX, 2000),
		maxSize: positive(env.READER_CACHE_MB, 64) * 1024 * 1024,
		// Approximate bytes held: the JSON length (strings dominate), counted once when stored.
		sizeCalculation: (v) => Math.max(1, JSON.stringify(v).length),
		fetchMethod: async (_key, _stale, { context }) => context()
	});
	return cache;
}

/** A rendered anonymous page: its bytes and headers as first sent. */
interface CachedPage {
	body: Uint8Array;
	headers: [string, string][];
}

let pages: LRUCache<string, CachedPage> | null = null;

/** Rendered anonymous pages by ETag (which names app version, origin, build and view version): `READER_PAGES_MB`, 32 MB. */
function pageCache(): LRUCache<string, CachedPage> {
	pages ??= new LRUCache<string, CachedPage>({
		max: positive(env.READER_CACHE_MAX, 2000),
		maxSize: positive(env.READER_PAGES_MB, 32) * 1024 * 1024,
		sizeCalculation: (p) => Math.max(1, p.body.byteLength)
	});
	return pages;
}

/** The cache key of what an anonymous reader sees of `b`. */
export function readerKey(b: Pick<Build, 'id' | 'viewVersion'>): string {
	return `${b.id}:${b.viewVersion}`;
}

/** True when an anonymous reader's view of `b` may be cached (published or archived). */
export function readerCacheable<T extends Pick<Build, 'status'>>(b: T | null): b is T {
	return !!b && b.status !== 'draft';
}

/**
 * The anonymous page data of `b` at its current view version: from the cache, or computed once (two
 * requests that miss at the same time share one computation). The key is read before the data, so
 * what is stored under a version is never older than that version.
 */
export async function cachedReaderData<T extends PageData>(b: Pick<Build, 'id' | 'viewVersion'>, compute: () => Promise<T>): Promise<T> {
	const v = await readerCache().fetch(readerKey(b), { context: compute });
	return v as T;
}

/** Drop everything (tests; never needed for correctness). */
export function clearReaderCache(): void {
	cache?.clear();
	pages?.clear();
	heads?.clear();
}

/** How many entries and bytes the cache holds (for the bench script and tests). */
export function readerCacheStats(): { entries: number; bytes: number } {
	return { entries: cache?.size ?? 0, bytes: cache?.calculatedSize ?? 0 };
}

/** Weak ETag of the anonymous page of `b`: app version, origin, build id and view version. */
export function readerEtag(b: Pick<Build, 'id' | 'viewVersion'>, origin: string): string {
	return `W/"r${createHash('sha1').update(`${version}\n${origin}\n${b.id}\n${b.viewVersion}`).digest('base64url').slice(0, 22)}"`;
}

const BUILD_PAGE = /^\/builds\/([^/]+)\/?$/;
/** Readers' browsers keep the page but ask every time (a new comment shows at once). */
export const READER_CACHE_CONTROL = 'no-cache';

/** What the hook needs of a build to label and find its anonymous page. */
type Head = Pick<Build, 'id' | 'status' | 'viewVersion' | 'viewChangedAt'>;

/**
 * The head of the build behind a slug, by site-wide reader version: while that version has not moved, no
 * build a reader can see has changed (./reader-version), so the head read at that version still holds
 * and the request needs no query of its own. Drafts are not kept (their pages are never cached).
 */
let heads: LRUCache<string, { readerVersion: number; head: Head }> | null = null;

async function headOf(slug: string): Promise<Head | null> {
	heads ??= new LRUCache({ max: positive(env.READER_CACHE_MAX, 2000) * 4 });
	const { version } = await currentReaderVersion();
	const known = heads.get(slug);
	if (known && known.readerVersion === version) return known.head;
	// Read after the version: what is kept under `version` is never older than it.
	const head = await getBuildHead(slug);
	if (head && readerCacheable(head)) heads.set(slug, { readerVersion: version, head });
	else heads.delete(slug);
	return head;
}

/**
 * For an anonymous GET of a build page: find the build's head (id, status, view version) — from the
 * per-version head cache, else one small indexed query — answer 304 when the browser holds this version
 * (If-None-Match, or If-Modified-Since when no ETag was sent), serve the page rendered for this version
 * when this process has it, otherwise read the whole row, let the page render (its load takes the row
 * from `locals.readerBuild`), label the answer and keep it.
 */
export const handleReaderCache: Handle = async ({ event, resolve }) => {
	const m = event.request.method === 'GET' && !event.isDataRequest && !event.locals.user && !event.url.search ? BUILD_PAGE.exec(event.url.pathname) : null;
	if (!m) return resolve(event);
	let slug: string;
	try {
		slug = decodeURIComponent(m[1]);
	} catch {
		return resolve(event);
	}
	let b: Head | null = await headOf(slug);
	if (!readerCacheable(b)) return resolve(event);
	const labelsOf = (h: Head) => ({
		etag: readerEtag(h, event.url.origin),
		'last-modified': new Date(Math.floor(h.viewChangedAt.getTime() / 1000) * 1000).toUTCString(),
		'cache-control': READER_CACHE_CONTROL,
		vary: 'Cookie'
	});
	let labels = labelsOf(b);
	const inm = event.request.headers.get('if-none-match');
	const ims = Date.parse(event.request.headers.get('if-modified-since') ?? '');
	if (inm ? etagMatches(inm, labels.etag) : Number.isFinite(ims) && ims >= Math.floor(b.viewChangedAt.getTime() / 1000) * 1000) {
		return new Response(null, { status: 304, headers: labels });
	}
	const hit = pageCache().get(labels.etag);
	if (hit) return new Response(hit.body.slice(), { status: 200, headers: hit.headers });
	// Not rendered here yet: the page needs the whole row (read now, so it is at least as new as the head).
	const row = await getBuildBySlug(slug);
	if (!readerCacheable(row)) return resolve(event);
	event.locals.readerBuild = row;
	b = row;
	labels = labelsOf(row);
	const response = await resolve(event);
	if (response.status !== 200 || response.headers.has('set-cookie')) return response;
	for (const [k, v] of Object.entries(labels)) response.headers.set(k, v);
	if (!(response.headers.get('content-type') ?? '').startsWith('text/html')) return response;
	const body = new Uint8Array(await response.arrayBuffer());
	// A page with a per-request CSP nonce must never be served twice (kit.csp is in hash mode: none).
	if (!new TextDecoder().decode(body).includes(' nonce=')) pageCache().set(labels.etag, { body, headers: [...response.headers] });
	return new Response(body, { status: 200, headers: response.headers });
};
