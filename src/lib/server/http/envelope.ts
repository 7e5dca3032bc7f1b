import { json } from '@sveltejs/kit';
import type { ZodError } from 'zod';
import { checkedBodyOf } from './checked-body';

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

/**
 * The one status → error-code table: the envelope's `code` for each HTTP status we answer with. Used by
 * the API guard, the photo routes and the /api/v1 envelope hook alike.
 */
const CODE_FOR_STATUS: Readonly<Record<number, ApiErrorCode>> = {
	400: 'invalid',
	401: 'unauthenticated',
	403: 'forbidden',
	404: 'not_found',
	405: 'method_not_allowed',
	409: 'conflict',
	413: 'too_large',
	// Request Header Fields Too Large (RFC 6585): the address or headers, rather than the body, are too large;
	// API.md's `too_large` is the code for "what you sent is too large" (server.js answers it, client-error.js).
	431: 'too_large',
	415: 'invalid',
	422: 'invalid',
	429: 'rate_limited',
	503: 'unavailable'
};

/** The envelope code for `status`: from the table, else `invalid` for another 4xx and `internal` for a 5xx. */
export function codeForStatus(status: number): ApiErrorCode {
	return CODE_FOR_STATUS[status] ?? (status >= 500 ? 'internal' : 'invalid');
}

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

/**
 * Read a JSON body (400 `invalid` when it is not JSON). Takes the value the request guards already parsed
 * and cleaned (http/checked-body.ts) instead of reading the body again.
 */
export async function readJson(request: Request): Promise<{ ok: true; body: unknown } | { ok: false; response: Response }> {
	const checked = checkedBodyOf(request)?.json;
	if (checked) return { ok: true, body: checked.value };
	try {
		return { ok: true, body: await request.json() };
	} catch {
		return {
			ok: false,
			response: apiError(400, 'invalid', 'The body is not valid JSON.', [{ path: '', message: 'malformed JSON' }])
		};
	}
}

/** 405 `method_not_allowed` for a known route asked with another method; `Allow` lists the methods it answers. */
export function methodNotAllowed(allowed: readonly string[]): Response {
	return apiError(405, 'method_not_allowed', `This route answers ${allowed.join(', ')} only.`, [], {
		Allow: allowed.join(', ')
	});
}

/**
 * 422 for a RangeError from the computation library: the issue path is the error's `field`
 * (InputRangeError) when it has one, else `fallbackPath`; `prefix` is put in front (e.g. ['data']).
 */
export function rangeErrorResponse(err: RangeError, fallbackPath = '', prefix: readonly PropertyKey[] = []): Response {
	const field = (err as RangeError & { field?: unknown }).field;
	const own = typeof field === 'string' && field !== '' ? field.split('.') : fallbackPath ? fallbackPath.split('.') : [];
	return apiError(422, 'invalid', err.message, [
		{ path: issuePath([...prefix, ...own.map((p) => (/^\d+$/.test(p) ? Number(p) : p))]), message: err.message }
	]);
}

/** Query parameters as a plain object for a zod schema; empty values count as missing, the last repeat wins. */
export function queryObject(url: URL): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [k, v] of url.searchParams) if (v.trim() !== '') out[k] = v.trim();
	return out;
}

/** Minimal structural view of a zod schema, so this module needs no zod runtime import. */
interface SafeParser<T> {
	safeParse(input: unknown): { success: true; data: T } | { success: false; error: ZodError };
}

/**
 * Validate `input` with `schema`, run `compute` on the parsed value and answer 200 JSON. Answers the envelope for
 * a failed parse (400/422 via zodErrorResponse) and for a RangeError from the library (422 at its field or
 * `fallbackPath`); anything else is logged and answered 500 `internal` without details.
 */
export function toolResponse<T>(schema: SafeParser<T>, input: unknown, compute: (value: T) => unknown, fallbackPath = ''): Response {
	const parsed = schema.safeParse(input);
	if (!parsed.success) return zodErrorResponse(parsed.error);
	try {
		return json(compute(parsed.data));
	} catch (err) {
		if (err instanceof RangeError) return rangeErrorResponse(err, fallbackPath);
		console.error('tool computation failed', err);
		return apiError(500, 'internal', 'The computation failed unexpectedly.');
	}
}
