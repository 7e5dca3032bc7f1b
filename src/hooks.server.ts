import { sequence } from '@sveltejs/kit/hooks';
import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { building } from '$app/environment';
import { handleAuth, handleApiEnvelope, handleApiRateLimit, handleHttpCache, handleControlCharacters, handleRequestGuards, handleSecurityHeaders } from '$lib/server/hooks';
import { startBackground } from '$lib/server/startup';
import { handleUnavailable, noteUnavailable } from '$lib/server/hooks/unavailable';
import { unavailableMessage } from '$lib/server/http/unavailable';
import { handleIdempotency } from '$lib/server/http/idempotency';
import { handleReaderCache } from '$lib/server/builds/reader-cache';
import { handleListCache } from '$lib/server/builds/list-cache';

export const init: ServerInit = async () => {
	if (!building) await startBackground();
};

export const handle: Handle = sequence(handleUnavailable, handleSecurityHeaders, handleApiEnvelope, handleRequestGuards, handleControlCharacters, handleAuth, handleReaderCache, handleListCache, handleIdempotency, handleApiRateLimit, handleHttpCache);

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	if (status === 404) return { message: 'Not found' };
	// SvelteKit refuses a form action posted as anything but a form (say JSON) before the action runs.
	if (status === 415) return { message: 'This form takes a form post (multipart/form-data or application/x-www-form-urlencoded) and nothing else.' };
	const service = noteUnavailable(event, error);
	if (service) {
		console.error(`[unavailable] ${event.request.method} ${event.url.pathname}: ${service}`, (error as Error)?.message);
		return { message: unavailableMessage(service) };
	}
	const errorId = crypto.randomUUID();
	console.error(`[${errorId}] ${event.request.method} ${event.url.pathname}`, error);
	return { message: status >= 500 ? 'Something went wrong on our side.' : message, errorId };
};
