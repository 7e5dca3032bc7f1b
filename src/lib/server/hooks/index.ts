import type { Handle } from '@sveltejs/kit';
import { svelteKitHandler, isAuthPath } from 'better-auth/svelte-kit';
import { building } from '$app/environment';
import { auth, CLIENT_ADDRESS_HEADER } from '../auth';
import { apiError, codeForStatus } from '../http';

/** Resolve the session once per request into locals, then let better-auth serve /api/auth/*. */
export const handleAuth: Handle = async ({ event, resolve }) => {
	const session = await auth.api.getSession({ headers: event.request.headers });
	if (session && !session.user.suspendedAt) {
		event.locals.user = session.user;
		event.locals.session = session.session;
	} else {
		event.locals.user = null;
		event.locals.session = null;
	}
	if (!building && isAuthPath(event.url.toString(), auth.options)) {
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

/** Conservative security headers on every response. */
export const handleSecurityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	try {
		response.headers.set('x-content-type-options', 'nosniff');
		response.headers.set('referrer-policy', 'strict-origin-when-cross-origin');
		if (!response.headers.has('x-frame-options')) response.headers.set('x-frame-options', 'DENY');
	} catch {
		/* immutable headers (a proxied response): leave them */
	}
	return response;
};

export { handleApiRateLimit, handleHttpCache } from './api-http';
