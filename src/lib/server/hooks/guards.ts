/**
 * What every request must pass before a route sees it: the cross-site check for form submissions
 * (SvelteKit's own, moved here so the RFC 8058 one-click unsubscribe can be let through), JSON-only
 * API writes (415 otherwise) and request body caps (413).
 */
import type { Handle } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { apiError } from '../http';
import { cleanJson, cleanedSearch, hasControls, pathHasControls, stripControls, stripLineControls } from '../http/control-chars';

/** Body cap for JSON API writes (bytes; `API_BODY_MAX_BYTES`, 64 KB). */
export const apiBodyMax = () => positive(env.API_BODY_MAX_BYTES, 64 * 1024);
/**
 * Body cap for form posts to pages (`FORM_BODY_MAX_BYTES`, 256 KB): a step may hold 20,000 characters,
 * which a form without JavaScript sends percent-encoded at up to 12 bytes a character.
 */
export const formBodyMax = () => positive(env.FORM_BODY_MAX_BYTES, 256 * 1024);
/** The parts-list CSV import takes files up to 1 MB. */
const CSV_BODY_MAX = 1_100_000;

function positive(v: string | undefined, fallback: number): number {
	const n = Number(v);
	return Number.isFinite(n) && n > 0 ? Math.floor(n) : fallback;
}

const WRITE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
const FORM_TYPES = ['application/x-www-form-urlencoded', 'multipart/form-data', 'text/plain'];

/** Routes that take uploads; adapter-node's BODY_SIZE_LIMIT (and the photo pipeline) bounds them. */
export function isUploadRoute(pathname: string): boolean {
	return /^\/builds\/[^/]+\/(photos|attachments|built-it\/photo)\/?$/.test(pathname) || pathname.startsWith('/account/avatar');
}

/** The largest body a request to `pathname` may carry, or null for upload routes. */
export function bodyCapFor(pathname: string): number | null {
	if (isUploadRoute(pathname)) return null;
	if (pathname.startsWith('/api/')) return apiBodyMax();
	if (/^\/builds\/[^/]+\/edit\/parts\/?$/.test(pathname)) return CSV_BODY_MAX;
	return formBodyMax();
}

/** One-click unsubscribe (RFC 8058): a mail client POSTs from no page at all; the token is the proof. */
export const ONE_CLICK = '/unsubscribe/one-click';

function tooLarge(api: boolean, cap: number): Response {
	const message = `The request is too large: at most ${Math.round(cap / 1024)} KB is accepted here.`;
	return api ? apiError(413, 'too_large', message) : new Response(message, { status: 413, headers: { 'content-type': 'text/plain; charset=utf-8', connection: 'close' } });
}

/** Byte length of a body without a Content-Length, read from a copy up to `cap` + 1. */
async function measured(request: Request, cap: number): Promise<number> {
	const reader = request.clone().body?.getReader();
	if (!reader) return 0;
	let total = 0;
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) break;
			total += value.byteLength;
			if (total > cap) break;
		}
	} finally {
		// Cancelling one branch of a tee settles only when the other is cancelled too: don't wait for it.
		void reader.cancel().catch(() => undefined);
	}
	return total;
}

/**
 * A refused body is read and thrown away (up to this many bytes) before the answer goes out: a server
 * that closes a connection with request bytes still unread resets it, and the client loses the 413.
 */
const DISCARD_MAX = 16 * 1024 * 1024;

/** Read and discard the rest of `request`'s body; false when it ran past `limit` (then the connection closes). */
async function discardBody(request: Request, limit: number): Promise<boolean> {
	const reader = request.body?.getReader();
	if (!reader) return true;
	let total = 0;
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) return true;
			total += value.byteLength;
			if (total > limit) {
				void reader.cancel().catch(() => undefined);
				return false;
			}
		}
	} catch {
		return false;
	}
}

export const handleRequestGuards: Handle = async ({ event, resolve }) => {
	const { request, url } = event;
	const method = request.method;
	if (!WRITE.has(method)) return resolve(event);
	const api = url.pathname.startsWith('/api/v1');
	const type = (request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	const origin = request.headers.get('origin');

	// Cross-site form submissions carry the member's cookie: refuse them (SvelteKit's rule).
	if (FORM_TYPES.includes(type) && origin !== url.origin && url.pathname !== ONE_CLICK) {
		const message = `Cross-site ${method} form submissions are forbidden.`;
		return api ? apiError(403, 'forbidden', message) : new Response(message, { status: 403, headers: { 'content-type': 'text/plain; charset=utf-8' } });
	}

	const declared = request.headers.get('content-length');
	const hasBody = declared !== null ? Number(declared) > 0 : request.body !== null && method !== 'DELETE';
	// JSON API writes take JSON only: a page on another site cannot send that without asking first (CORS).
	if (api && hasBody && type !== 'application/json') {
		return apiError(415, 'invalid', 'Send the body as JSON with Content-Type: application/json.', [], { accept: 'application/json' });
	}

	const cap = bodyCapFor(url.pathname);
	if (cap !== null && hasBody) {
		const size = declared !== null ? Number(declared) : await measured(request, cap);
		if (!Number.isFinite(size) || size > cap) {
			const response = tooLarge(api, cap);
			if (size <= DISCARD_MAX && (await discardBody(request, DISCARD_MAX))) response.headers.delete('connection');
			else response.headers.set('connection', 'close');
			return response;
		}
	}
	return resolve(event);
};

// eslint-disable-next-line no-control-regex
const ESCAPED_CONTROL = /\\u00[01][0-9a-fA-F]|\\u007[fF]/;

function withBody(req: Request, body: BodyInit, keepType: boolean): Request {
	const headers = new Headers(req.headers);
	headers.delete('content-length');
	if (!keepType) headers.delete('content-type');
	return new Request(req.url, { method: req.method, headers, body, signal: req.signal });
}

/**
 * The request with control characters removed from every text it carries, or null when it had none;
 * 'unreadable' for a multipart body that cannot be parsed (the handler answers 400 for it).
 */
export async function cleanedRequest(req: Request): Promise<Request | null | 'unreadable'> {
	if (!req.body) return null;
	const type = (req.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	if (type === 'application/json') {
		const text = await req.clone().text();
		if (!hasControls(text) && !ESCAPED_CONTROL.test(text)) return null;
		let parsed: unknown;
		try {
			parsed = JSON.parse(stripControls(text));
		} catch {
			return null; // the route answers "not valid JSON"
		}
		return withBody(req, JSON.stringify(cleanJson(parsed)), true);
	}
	if (type === 'application/x-www-form-urlencoded') {
		const params = new URLSearchParams(await req.clone().text());
		let dirty = false;
		const out = new URLSearchParams();
		for (const [k, v] of params) {
			const ck = stripLineControls(k);
			const cv = stripControls(v);
			if (ck !== k || cv !== v) dirty = true;
			out.append(ck, cv);
		}
		return dirty ? withBody(req, out.toString(), true) : null;
	}
	if (type === 'multipart/form-data') {
		let form: FormData;
		try {
			form = await req.clone().formData();
		} catch {
			return 'unreadable'; // cut off or malformed (e.g. a raw line break inside a file name)
		}
		let dirty = false;
		const out = new FormData();
		for (const [k, v] of form) {
			const ck = stripLineControls(k);
			if (ck !== k) dirty = true;
			if (typeof v === 'string') {
				const cv = stripControls(v);
				if (cv !== v) dirty = true;
				out.append(ck, cv);
			} else {
				out.append(ck, v, v.name);
			}
		}
		return dirty ? withBody(req, out, false) : null;
	}
	return null;
}

/**
 * Control characters never reach a route: a path holding one names no page (404), query strings and
 * form or JSON bodies lose them (tab, LF and CR stay in bodies). Uploads keep their bytes; their text
 * fields are checked where they are read.
 */
export const handleControlCharacters: Handle = async ({ event, resolve }) => {
	const { url } = event;
	if (pathHasControls(url.pathname)) {
		return url.pathname.startsWith('/api/')
			? apiError(404, 'not_found', 'No such route: the address holds control characters.')
			: new Response('Not found: the address holds control characters.', { status: 404, headers: { 'content-type': 'text/plain; charset=utf-8' } });
	}
	const search = cleanedSearch(url);
	if (search !== null) url.search = search;
	if (WRITE.has(event.request.method) && !isUploadRoute(url.pathname)) {
		const cleaned = await cleanedRequest(event.request);
		// A form action would fail reading it (a 500): say so here, as upload routes do for theirs.
		if (cleaned === 'unreadable') {
			const message = 'The form arrived incomplete or malformed. Try again.';
			return url.pathname.startsWith('/api/')
				? apiError(400, 'invalid', message)
				: new Response(message, { status: 400, headers: { 'content-type': 'text/plain; charset=utf-8' } });
		}
		if (cleaned) event.request = cleaned;
	}
	return resolve(event);
};
