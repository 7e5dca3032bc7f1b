import type { Handle } from '@sveltejs/kit';
import { consumeWrite, isLimitedWrite, rateLimitedResponse } from '../rate-limit';
import { cachePolicy, withValidators } from '../http-cache';

/** API writes (comments, reports, bench …) count against a per-member budget; over it → 429 `rate_limited`. */
export const handleApiRateLimit: Handle = async ({ event, resolve }) => {
	if (isLimitedWrite(event.request.method, event.url.pathname)) {
		const verdict = await consumeWrite({ userId: event.locals.user?.id, address: event.getClientAddress() });
		if (!verdict.ok) return rateLimitedResponse(verdict.retryAfterS);
	}
	return resolve(event);
};

/** Public reads (API GETs, feeds, sitemap) get a weak ETag, Cache-Control, and 304 on If-None-Match. */
export const handleHttpCache: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	if (event.request.method !== 'GET') return response;
	const policy = cachePolicy(event.url.pathname, !!event.locals.user);
	return policy ? withValidators(event.request, response, policy) : response;
};
