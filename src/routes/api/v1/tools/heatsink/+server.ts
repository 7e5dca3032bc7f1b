import type { RequestHandler } from './$types';
import { heatsink } from '$lib/engineering';
import { heatsinkToolInput } from '$lib/schemas/tools';
import { methodNotAllowed, readJson, toolResponse } from '$lib/server/http';

/** POST /api/v1/tools/heatsink — required heatsink Rθsa and junction temperature (API.md). */
export const POST: RequestHandler = async ({ request }) => {
	const body = await readJson(request);
	if (!body.ok) return body.response;
	return toolResponse(heatsinkToolInput, body.body, (input) => heatsink(input));
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
