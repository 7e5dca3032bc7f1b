import { json } from '@sveltejs/kit';
import type { ZodError } from 'zod';

/** Stable error codes of the JSON envelope (API.md). */
export type ApiErrorCode =
	| 'invalid'
	| 'unauthenticated'
	| 'forbidden'
	| 'not_found'
	| 'method_not_allowed'
	| 'conflict'
	| 'too_large'
	| 'rate_limited'
	| 'unavailable'
	| 'internal';

export interface ApiIssue {
	path: string;
	message: string;
}

/** Build the one JSON error envelope every API route answers with. */
export function apiError(
	status: number,
	code: ApiErrorCode,
	message: string,
	issues: ApiIssue[] = [],
	headers?: HeadersInit
): Response {
	return json({ error: { code, message, issues } }, { status, headers });
}

/** Dot path with numeric array indexes: ['data','device','minLoadOhm'] → 'data.device.minLoadOhm'. */
export function issuePath(path: readonly PropertyKey[]): string {
	return path.map((p) => String(p)).join('.');
}

/** zod issue codes that mean "a number out of its range / a value we cannot represent" → 422. */
const rangeCodes = new Set(['too_small', 'too_big', 'not_multiple_of', 'custom']);

/**
 * Answer a failed zod parse: 400 for shape problems (missing field, wrong type, bad enum),
 * 422 when every issue is a value out of range or not representable.
 */
export function zodErrorResponse(err: ZodError, prefix: readonly PropertyKey[] = []): Response {
	const issues = err.issues.map((i) => ({
		path: issuePath([...prefix, ...i.path]),
		message: i.message
	}));
	const allRange = err.issues.every((i) => rangeCodes.has(i.code));
	const status = allRange ? 422 : 400;
	const message = allRange ? 'Some values are out of range.' : 'The request is malformed.';
	return apiError(status, 'invalid', message, issues);
}

/** Read a JSON body; undefined when the body is not JSON (caller answers 400). */
export async function readJson(request: Request): Promise<{ ok: true; body: unknown } | { ok: false; response: Response }> {
	try {
		return { ok: true, body: await request.json() };
	} catch {
		return {
			ok: false,
			response: apiError(400, 'invalid', 'The body is not valid JSON.', [{ path: '', message: 'malformed JSON' }])
		};
	}
}
