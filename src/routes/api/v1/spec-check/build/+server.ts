import type { RequestHandler } from './$types';
import { json } from '@sveltejs/kit';
import { specCheckBuildInput } from '$lib/schemas/tools';
import { apiError, methodNotAllowed, rangeErrorResponse, readJson, zodErrorResponse } from '$lib/server/http';
import { checkBuildRequest } from '$lib/server/specs';

/**
 * POST /api/v1/spec-check/build — `{ blocks: [{ kind, data }], parts? }` → `{ blocks: [{ derived, checks }], cross }`
 * (API.md). The same computation as the build page's checks; a bad block → 400/422 with paths like
 * `blocks.2.data.railV`.
 */
export const POST: RequestHandler = async ({ request }) => {
	const body = await readJson(request);
	if (!body.ok) return body.response;
	const top = specCheckBuildInput.safeParse(body.body);
	if (!top.success) return zodErrorResponse(top.error);
	try {
		const r = checkBuildRequest(top.data.blocks, top.data.parts);
		if (r.ok) return json(r.body);
		if ('zod' in r) return zodErrorResponse(r.zod);
		return rangeErrorResponse(r.range, '', ['blocks', r.index, 'data']);
	} catch (err) {
		console.error('spec-check/build failed', err);
		return apiError(500, 'internal', 'The spec check failed unexpectedly.');
	}
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
