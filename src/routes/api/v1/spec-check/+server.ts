import type { RequestHandler } from './$types';
import { json } from '@sveltejs/kit';
import { ZodError } from 'zod';
import { runSpec } from '$lib/specs';
import { specCheckInput } from '$lib/schemas/tools';
import { apiError, methodNotAllowed, rangeErrorResponse, readJson, zodErrorResponse } from '$lib/server/http';

/**
 * POST /api/v1/spec-check — `{ kind, data }` → `{ derived, checks }` (API.md). The block is validated by its
 * kind's schema; issue paths are prefixed `data.` (e.g. `data.device.minLoadOhm`).
 */
export const POST: RequestHandler = async ({ request }) => {
	const body = await readJson(request);
	if (!body.ok) return body.response;
	const top = specCheckInput.safeParse(body.body);
	if (!top.success) return zodErrorResponse(top.error);
	try {
		return json(runSpec(top.data.kind, top.data.data));
	} catch (err) {
		if (err instanceof ZodError) return zodErrorResponse(err, ['data']);
		if (err instanceof RangeError) return rangeErrorResponse(err, '', ['data']);
		console.error('spec-check failed', err);
		return apiError(500, 'internal', 'The spec check failed unexpectedly.');
	}
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
