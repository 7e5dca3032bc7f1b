import type { Handle } from '@sveltejs/kit';
import { svelteKitHandler, isAuthPath } from 'better-auth/svelte-kit';
import { building } from '$app/environment';
import { auth, AUTH_HTTP_PATHS, CLIENT_ADDRESS_HEADER } from '../auth';
import { apiError, codeForStatus } from '../http';
import { passwordSignIn } from '../members';

const AUTH_BASE = '/api/auth';

/** True for the better-auth endpoints we serve over HTTP (AUTH_HTTP_PATHS); the rest answer 404. */
export function authPathServed(pathname: string): boolean {
	const sub = pathname.slice(AUTH_BASE.length);
	return AUTH_HTTP_PATHS.some((p) => (p.endsWith('/') ? sub.startsWith(p) && sub.length > p.length : sub === p));
}

/** `POST /api/auth/sign-in/email` takes the same road as the sign-in form (per-account failure limit). */
async function httpSignIn(request: Request, clientAddress: string): Promise<Response> {
	const type = (request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	if (type !== 'application/json') return Response.json({ code: 'UNSUPPORTED_MEDIA_TYPE', message: 'Send JSON.' }, { status: 415 });
	const body = (await request.json().catch(() => null)) as { email?: unknown; password?: unknown } | null;
	if (!body || typeof body.email !== 'string' || typeof body.password !== 'string') {
		return Response.json({ code: 'INVALID_INPUT', message: 'Send an e-mail and a password.' }, { status: 400 });
	}
	return passwordSignIn(body.email, body.password, clientAddress);
}

/**
 * True when the request carries a better-auth session cookie (`better-auth.session_token`, with the
 * `__Secure-` prefix over https). Without one there is no session to look up.
 */
export function hasSessionCookie(cookie: string | null): boolean {
	return !!cookie && cookie.includes('.session_token=');
}

/** Resolve the session once per request into locals, then let better-auth serve /api/auth/*. */
export const handleAuth: Handle = async ({ event, resolve }) => {
	// Anonymous readers (no session cookie) skip the session lookup: most requests are theirs.
	const session = hasSessionCookie(event.request.headers.get('cookie')) ? await auth.api.getSession({ headers: event.request.headers }) : null;
	if (session && !session.user.suspendedAt) {
		event.locals.user = session.user;
		event.locals.session = session.session;
	} else {
		event.locals.user = null;
		event.locals.session = null;
	}
	if (!building && isAuthPath(event.url.toString(), auth.options)) {
		if (!authPathServed(event.url.pathname)) return Response.json({ code: 'NOT_FOUND', message: 'Not found' }, { status: 404 });
		if (event.url.pathname === `${AUTH_BASE}/sign-in/email` && event.request.method === 'POST') {
			return httpSignIn(event.request, event.getClientAddress());
		}
		// Pass the client address in a header only the server sets, so better-auth's rate limiter
		// keys on the real client (a header the client sent under that name is overwritten).
		const headers = new Headers(event.request.headers);
		headers.set(CLIENT_ADDRESS_HEADER, event.getClientAddress());
		return auth.handler(new Request(event.request, { headers }));
	}
	return svelteKitHandler({ event, resolve, auth, building });
};

/**
 * Every /api/v1 error answers with the one JSON envelope of API.md, also when it was raised by
 * `error()` in a guard or by SvelteKit itself (unknown route, wrong method).
 */
export const handleApiEnvelope: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	if (!event.url.pathname.startsWith('/api/v1') || response.status < 400) return response;
	const type = response.headers.get('content-type') ?? '';
	if (type.includes('application/json')) {
		const body = await response.clone().json().catch(() => null);
		if (body && typeof body === 'object' && 'error' in body) return response;
		const message = (body as { message?: string } | null)?.message ?? response.statusText;
		return apiError(response.status, codeForStatus(response.status), message || 'Request failed.');
	}
	const status = response.status;
	const message =
		status === 404 ? 'No such route.' : status === 405 ? 'This route does not accept that method.' : 'Request failed.';
	const headers = new Headers();
	const allow = response.headers.get('allow');
	if (allow) headers.set('allow', allow);
	return apiError(status, codeForStatus(status), message, [], headers);
};

/** HSTS for a site served over https: two years, subdomains included (RFC 6797). */
export const HSTS = 'max-age=63072000; includeSubDomains';

/**
 * Conservative security headers on every response; Strict-Transport-Security when the site is served
 * over https. (The Content-Security-Policy of pages comes from `kit.csp` in svelte.config.js.)
 */
export const handleSecurityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	try {
		response.headers.set('x-content-type-options', 'nosniff');
		response.headers.set('referrer-policy', 'strict-origin-when-cross-origin');
		if (!response.headers.has('x-frame-options')) response.headers.set('x-frame-options', 'DENY');
		if (event.url.protocol === 'https:') response.headers.set('strict-transport-security', HSTS);
		// Anything that is not a page (JSON, media, feeds) may not run or load anything either.
		if (!response.headers.has('content-security-policy') && !(response.headers.get('content-type') ?? '').startsWith('text/html')) {
			response.headers.set('content-security-policy', "default-src 'none'; frame-ancestors 'none'; sandbox");
		}
	} catch {
		/* immutable headers (a proxied response): leave them */
	}
	return response;
};

export { handleApiRateLimit, handleHttpCache } from './api-http';
export { handleRequestGuards, handleControlCharacters } from './guards';
