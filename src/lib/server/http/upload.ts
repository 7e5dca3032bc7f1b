import { isHttpError, isRedirect, redirect } from '@sveltejs/kit';
import { apiError, codeForStatus, type ApiErrorCode } from './envelope';
import { escapeUTF8 as escapeHtml } from 'entities';
import { discardBody } from './discard';

/** A refusal about one field of an upload, answered as the envelope with one issue at `path`. */
export class FieldError extends Error {
	constructor(
		readonly status: 400 | 404 | 413 | 415 | 422 | 429 | 503,
		readonly code: ApiErrorCode,
		message: string,
		readonly path: string = 'file'
	) {
		super(message);
		this.name = 'FieldError';
	}
}

/**
 * Run an upload route's handler (photos) and answer every expected failure with the JSON error envelope,
 * or with a small page for a plain no-JS form (`htmlBack`): a FieldError (bad upload), or an `error()`
 * thrown by a guard (401/403/404). Redirects and unexpected errors pass through (the latter become a
 * logged 500 without details).
 */
export async function uploadRoute(
	request: Request,
	handler: () => Promise<Response>,
	opts: { htmlBack?: string; drainLimit?: number; refusalTitle?: string } = {}
): Promise<Response> {
	try {
		return await handler();
	} catch (err) {
		if (isRedirect(err)) throw err;
		let status: number;
		let response: Response;
		if (err instanceof FieldError) {
			status = err.status;
			response = opts.htmlBack
				? htmlRefusal(err.status, err.message, opts.htmlBack, opts.refusalTitle)
				: apiError(err.status, err.code, err.message, [{ path: err.path, message: err.message }]);
		} else if (isHttpError(err)) {
			status = err.status;
			response = opts.htmlBack
				? htmlRefusal(err.status, err.body.message, opts.htmlBack, opts.refusalTitle)
				: apiError(err.status, codeForStatus(err.status), err.body.message);
		} else {
			throw err;
		}
		return finishEarly(request, response, status, opts.drainLimit ?? 0);
	}
}

/**
 * The most of a refused upload's body read and thrown away (above the photo and attachment limits and
 * adapter-node's BODY_SIZE_LIMIT, which refuses a longer declared body before anything reads it).
 */
export const REFUSED_DRAIN_MAX = 32 * 1024 * 1024;

/**
 * A refusal sent before the upload was read (signed out, not the maker, too large): the rest of the body is
 * read and discarded first (`discardBody`: chunk by chunk, nothing kept), else a client still sending may see
 * a reset connection (EPIPE) instead of our answer. Up to `drainLimit` bytes for any refusal, up to
 * REFUSED_DRAIN_MAX for "too large" (a body declared, or found, longer than that gets the answer with
 * `connection: close`, as before).
 */
async function finishEarly(request: Request, response: Response, status: number, drainLimit: number): Promise<Response> {
	if (request.bodyUsed || !request.body) return response;
	const declared = Number(request.headers.get('content-length') ?? NaN);
	const limit = status === 413 ? Math.max(drainLimit, REFUSED_DRAIN_MAX) : drainLimit;
	const drain = Number.isFinite(declared) ? declared <= limit : status === 413;
	if (drain && (await discardBody(request.body.getReader(), limit))) return response;
	response.headers.set('connection', 'close');
	return response;
}

/** "Too large" for an upload (a photo or a picture) whose limit is `maxBytes`. */
export function uploadTooLarge(maxBytes: number, what = 'photo'): FieldError {
	return new FieldError(413, 'too_large', `The ${what} is larger than the ${Math.round(maxBytes / (1024 * 1024))} MB limit. Export it smaller and try again.`);
}

/**
 * The multipart form of an upload, with exactly one file under `field` (or none: the route says what is
 * missing). A body adapter-node stopped reading at BODY_SIZE_LIMIT (sent without Content-Length) is
 * "too large"; a broken or truncated body "arrived incomplete"; two files are refused.
 */
export async function readUploadForm(request: Request, field: string, maxBytes: number, what = 'photo'): Promise<FormData> {
	if (!(request.headers.get('content-type') ?? '').startsWith('multipart/form-data')) {
		throw new FieldError(415, 'invalid', `Send the ${what} as a form upload (multipart/form-data).`, '');
	}
	let form: FormData;
	try {
		form = await request.formData();
	} catch (err) {
		const tooLarge = (e: unknown): boolean =>
			!!e && ((e as { status?: number }).status === 413 || /exceeds limit/i.test(String((e as Error).message ?? '')) || tooLarge((e as Error).cause));
		if (tooLarge(err)) throw uploadTooLarge(maxBytes, what);
		throw new FieldError(400, 'invalid', 'The upload arrived incomplete. Try again.', '');
	}
	if (form.getAll(field).length > 1) throw new FieldError(400, 'invalid', `Send one ${what} at a time.`, field);
	return form;
}

/**
 * Who calls an upload route: a plain no-JS form (`html`: it wants a page back, at `back`) or a script
 * (JSON). A signed-out plain form is sent to sign-in first, with the way back.
 */
export function uploadCaller(event: { request: Request; url: URL; locals: App.Locals }, fallback: string): { html: boolean; back: string } {
	const html = wantsHtml(event.request);
	const back = backTo(event.request, event.url.origin, fallback);
	if (!event.locals.user && html) redirect(303, `/sign-in?next=${encodeURIComponent(back)}`);
	return { html, back };
}

/** True when the caller is a plain HTML form (no JavaScript), which wants a page back, not JSON. */
export function wantsHtml(request: Request): boolean {
	const accept = request.headers.get('accept') ?? '';
	return accept.includes('text/html') && !accept.includes('application/json');
}

/** Same-origin page to send a no-JS form back to: the Referer when it is ours, else `fallback`. */
export function backTo(request: Request, origin: string, fallback: string): string {
	const ref = request.headers.get('referer');
	if (ref) {
		try {
			const u = new URL(ref);
			if (u.origin === origin) return u.pathname + u.search;
		} catch {
			/* ignore a malformed Referer */
		}
	}
	return fallback;
}

/** A minimal page for a no-JS form whose upload was refused: the sentence and a way back. */
export function htmlRefusal(status: number, message: string, back: string, title = 'Photo not added'): Response {
	const body = `<!doctype html><html lang="en"><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(title)} · Starground</title><body style="font-family:system-ui,sans-serif;max-width:40rem;margin:3rem auto;padding:0 1rem;background:#f7f2e8;color:#1f1d1a"><h1>${escapeHtml(title)}</h1><p>${escapeHtml(message)}</p><p><a href="${escapeHtml(back)}" style="color:#8a4220">Go back</a></p></body></html>`;
	return new Response(body, { status, headers: { 'content-type': 'text/html; charset=utf-8' } });
}
