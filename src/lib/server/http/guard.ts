import { isHttpError } from '@sveltejs/kit';
import { ZodError } from 'zod';
import { apiError, codeForStatus, zodErrorResponse } from './envelope';

/**
 * Run an API handler's body and answer the JSON envelope (API.md) for the refusals the domain modules
 * throw with `error(status, message)` — keeping their sentence whatever the request's Accept header —
 * and for ZodErrors. `issuePath` names the field a 422 concerns, when there is one.
 */
export async function apiGuard(fn: () => Promise<Response>, issuePath?: string): Promise<Response> {
	try {
		return await fn();
	} catch (e) {
		if (e instanceof ZodError) return zodErrorResponse(e);
		if (isHttpError(e) && e.status >= 400 && e.status < 500) {
			const message = e.body.message;
			const issues = e.status === 422 && issuePath ? [{ path: issuePath, message }] : [];
			return apiError(e.status, codeForStatus(e.status), message, issues);
		}
		throw e;
	}
}
