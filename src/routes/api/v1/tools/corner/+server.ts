import type { RequestHandler } from './$types';
import { rcCornerHz } from '$lib/engineering';
import { cornerToolInput } from '$lib/schemas/tools';
import { methodNotAllowed, readJson, toolResponse } from '$lib/server/http';

/** POST /api/v1/tools/corner — first-order RC corner (API.md). */
export const POST: RequestHandler = async ({ request }) => {
	const body = await readJson(request);
	if (!body.ok) return body.response;
	return toolResponse(cornerToolInput, body.body, (input) => ({ cornerHz: rcCornerHz(input.rOhm, input.cF) }));
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
