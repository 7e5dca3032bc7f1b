/**
 * What every request must pass before a route sees it: the cross-site check for form submissions
 * (SvelteKit's own, moved here so the RFC 8058 one-click unsubscribe can be let through), JSON-only
 * API writes (415 otherwise), request body caps (413, with or without a Content-Length) and control
 * characters. A write's body is read ONCE here: capped, cleaned, and handed to the route as a new Request
 * built from that text (a JSON body's parsed value kept beside it for `readJson`), so no route or hook
 * reads it through `request.clone()` again.
 */
import type { Handle } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { apiError } from '../http';
import { cleanJson, cleanedSearch, hasControls, pathHasControls, stripControls, stripLineControls } from '../http/control-chars';
import { keepCheckedBody, type CheckedBody } from '../http/checked-body';
import { discardBody } from '../http/discard';

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

/**
 * Read `request`'s body once, stopping after `cap` + 1 bytes: the bytes, or null when it ran past `cap`
 * (the rest is left in the stream for discardBody). Throws when the client broke off mid-body.
 */
async function readCapped(reader: ReadableStreamDefaultReader<Uint8Array>, cap: number): Promise<Uint8Array<ArrayBuffer> | null> {
	const chunks: Uint8Array[] = [];
	let total = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		total += value.byteLength;
		if (total > cap) return null;
		chunks.push(value);
	}
	if (chunks.length === 1 && chunks[0].buffer instanceof ArrayBuffer) return chunks[0] as Uint8Array<ArrayBuffer>;
	const out = new Uint8Array(total);
	let at = 0;
	for (const c of chunks) {
		out.set(c, at);
		at += c.byteLength;
	}
	return out;
}

/**
 * A refused body is read and thrown away (up to this many bytes) before the answer goes out: a server
 * that closes a connection with request bytes still unread resets it, and the client loses the 413.
 */
const DISCARD_MAX = 16 * 1024 * 1024;

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
	// Uploads keep their bytes and their own limit (adapter-node's BODY_SIZE_LIMIT, the photo pipeline).
	if (cap === null || !request.body) return resolve(event);
	const refuse = async (reader: ReadableStreamDefaultReader<Uint8Array> | undefined, size: number) => {
		const response = tooLarge(api, cap);
		if (size <= DISCARD_MAX && (await discardBody(reader, DISCARD_MAX))) response.headers.delete('connection');
		else response.headers.set('connection', 'close');
		return response;
	};
	const size = declared !== null ? Number(declared) : 0;
	if (!Number.isFinite(size) || size > cap) return refuse(request.body.getReader(), size);

	// The one read of the body (also without a Content-Length): capped, then checked for control characters.
	const reader = request.body.getReader();
	let bytes: Uint8Array<ArrayBuffer> | null;
	try {
		bytes = await readCapped(reader, cap);
	} catch {
		return unreadable(url.pathname, 'The request arrived incomplete. Try again.');
	}
	if (bytes === null) return refuse(reader, cap);
	const checked = await checkedRequest(request, bytes);
	// A form action would fail reading it (a 500): say so here, as upload routes do for theirs.
	if (checked === 'unreadable') return unreadable(url.pathname, 'The form arrived incomplete or malformed. Try again.');
	event.request = checked;
	return resolve(event);
};

/** A body that could not be read or parsed (cut off, malformed multipart): 400 with a sentence, never a 500. */
function unreadable(pathname: string, message: string): Response {
	return pathname.startsWith('/api/')
		? apiError(400, 'invalid', message)
		: new Response(message, { status: 400, headers: { 'content-type': 'text/plain; charset=utf-8' } });
}

// eslint-disable-next-line no-control-regex
const ESCAPED_CONTROL = /\\u00[01][0-9a-fA-F]|\\u007[fF]/;

/**
 * A Request for the route carrying `body` instead of the stream already read. The headers go on as sent
 * unless the body changed (then without its Content-Length / Transfer-Encoding, and without the
 * Content-Type when `keepType` is false: a rebuilt FormData brings its own boundary). The client's abort
 * signal is not passed on: following it costs a signal per request and no route watches it (the body is
 * already read in full).
 */
function withBody(req: Request, body: BodyInit, changed: boolean, keepType = true): Request {
	let headers: Headers = req.headers;
	if (changed || headers.has('transfer-encoding')) {
		headers = new Headers(headers);
		headers.delete('content-length');
		headers.delete('transfer-encoding');
		if (!keepType) headers.delete('content-type');
	}
	return new Request(req.url, { method: req.method, headers, body });
}

const utf8 = new TextDecoder();

/**
 * The request the route receives, built from the body already read (`bytes`), with control characters
 * removed from every text it carries (tab, LF and CR stay in values; keys lose them too); 'unreadable' for
 * a multipart body that cannot be parsed. A JSON body's parsed value is kept beside it for `readJson`.
 */
export async function checkedRequest(req: Request, bytes: Uint8Array<ArrayBuffer>): Promise<Request | 'unreadable'> {
	const type = (req.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	if (type === 'application/json') {
		let text = utf8.decode(bytes);
		let json: CheckedBody['json'];
		let changed = false;
		if (!hasControls(text) && !ESCAPED_CONTROL.test(text)) {
			try {
				json = { value: JSON.parse(text) };
			} catch {
				/* the route answers "not valid JSON" */
			}
		} else {
			try {
				const value = cleanJson(JSON.parse(stripControls(text)));
				text = JSON.stringify(value);
				json = { value };
				changed = true;
			} catch {
				/* the route answers "not valid JSON" */
			}
		}
		// Unchanged, the bytes go on as sent (their Content-Length still holds).
		const out = changed ? withBody(req, text, true) : withBody(req, bytes, false);
		keepCheckedBody(out, { text, json });
		return out;
	}
	if (type === 'application/x-www-form-urlencoded') {
		const text = utf8.decode(bytes);
		const params = new URLSearchParams(text);
		let dirty = false;
		const out = new URLSearchParams();
		for (const [k, v] of params) {
			const ck = stripLineControls(k);
			const cv = stripControls(v);
			if (ck !== k || cv !== v) dirty = true;
			out.append(ck, cv);
		}
		const cleaned = dirty ? out.toString() : text;
		const request = dirty ? withBody(req, cleaned, true) : withBody(req, bytes, false);
		keepCheckedBody(request, { text: cleaned });
		return request;
	}
	if (type === 'multipart/form-data') {
		let form: FormData;
		try {
			form = await new Response(bytes, { headers: { 'content-type': req.headers.get('content-type') ?? '' } }).formData();
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
		// A clean form goes on byte for byte (its boundary and parts as sent).
		const request = dirty ? withBody(req, out, true, false) : withBody(req, bytes, false);
		keepCheckedBody(request, { text: null });
		return request;
	}
	// Other types (text/plain to a page, say) go on unchanged.
	const request = withBody(req, bytes, false);
	keepCheckedBody(request, { text: null });
	return request;
}

/**
 * Control characters never reach a route: a path holding one names no page (404) and query strings lose
 * them. Bodies are read and cleaned once, by handleRequestGuards (tab, LF and CR stay in body values);
 * uploads keep their bytes and their text fields are checked where they are read.
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
	return resolve(event);
};
