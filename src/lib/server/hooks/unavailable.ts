import type { Handle, RequestEvent } from '@sveltejs/kit';
import { apiError } from '../http/envelope';
import { RETRY_AFTER_S, unavailableMessage, unavailableService, type Unavailable } from '../http/unavailable';

/** Remember on the request that a dependency failed (called from handleError). */
export function noteUnavailable(event: RequestEvent, error: unknown): Unavailable | null {
	const service = unavailableService(error);
	if (service) event.locals.unavailable = service;
	return service;
}

function unavailableResponse(event: RequestEvent, service: Unavailable, body?: BodyInit | null, type?: string | null): Response {
	const headers = { 'retry-after': String(RETRY_AFTER_S), 'cache-control': 'no-store' };
	const message = unavailableMessage(service);
	if (event.url.pathname.startsWith('/api/') || !body) return apiError(503, 'unavailable', message, [], headers);
	return new Response(body, { status: 503, headers: { ...headers, 'content-type': type ?? 'text/html; charset=utf-8' } });
}

/**
 * Outermost hook: when PostgreSQL or the object store does not answer, the request gets 503
 * `unavailable` with Retry-After and a sentence — in the API envelope for the API, the error page (with
 * that sentence) for pages — never a 500 or a hang. Covers errors thrown by the other hooks (session
 * lookup, rate limits) and errors in loads, actions and endpoints (marked by handleError).
 */
export const handleUnavailable: Handle = async ({ event, resolve }) => {
	let response: Response;
	try {
		response = await resolve(event);
	} catch (err) {
		const service = unavailableService(err);
		if (!service) throw err;
		console.error(`[unavailable] ${event.request.method} ${event.url.pathname}: ${service}`);
		return unavailableResponse(event, service);
	}
	const service = event.locals.unavailable;
	if (!service || response.status < 500) return response;
	// Pages and form actions keep SvelteKit's own body (the error page, or the action result a
	// JavaScript form reads), which carries the sentence from handleError; only the status changes.
	return unavailableResponse(event, service, await response.text(), response.headers.get('content-type'));
};
