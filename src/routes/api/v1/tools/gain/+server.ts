import type { RequestHandler } from './$types';
import { nonInvertingGain } from '$lib/engineering';
import { gainToolInput } from '$lib/schemas/tools';
import { methodNotAllowed, readJson, toolResponse } from '$lib/server/http';

/** POST /api/v1/tools/gain — non-inverting gain and gain in dB (API.md). */
export const POST: RequestHandler = async ({ request }) => {
	const body = await readJson(request);
	if (!body.ok) return body.response;
	return toolResponse(gainToolInput, body.body, (input) => nonInvertingGain(input.rfOhm, input.riOhm));
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
