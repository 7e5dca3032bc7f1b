import { sequence } from '@sveltejs/kit/hooks';
import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { building } from '$app/environment';
import { handleAuth, handleApiEnvelope, handleApiRateLimit, handleHttpCache, handleControlCharacters, handleRequestGuards, handleSecurityHeaders } from '$lib/server/hooks';
import { startBackground } from '$lib/server/startup';

export const init: ServerInit = async () => {
	if (!building) await startBackground();
};

export const handle: Handle = sequence(handleSecurityHeaders, handleApiEnvelope, handleRequestGuards, handleControlCharacters, handleAuth, handleApiRateLimit, handleHttpCache);

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	if (status === 404) return { message: 'Not found' };
	const errorId = crypto.randomUUID();
	console.error(`[${errorId}] ${event.request.method} ${event.url.pathname}`, error);
	return { message: status >= 500 ? 'Something went wrong on our side.' : message, errorId };
};
