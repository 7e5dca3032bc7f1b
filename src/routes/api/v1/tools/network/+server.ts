import type { RequestHandler } from './$types';
import { networkValue } from '$lib/engineering';
import { networkToolInput } from '$lib/schemas/tools';
import { methodNotAllowed, readJson, toolResponse } from '$lib/server/http';

/** POST /api/v1/tools/network — series/parallel combination in SI units (API.md). */
export const POST: RequestHandler = async ({ request }) => {
	const body = await readJson(request);
	if (!body.ok) return body.response;
	return toolResponse(networkToolInput, body.body, (input) => ({ value: networkValue(input.part, input.arrangement, input.values) }));
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
