import type { RequestHandler } from './$types';
import { supplyRails } from '$lib/engineering';
import { supplyToolInput } from '$lib/schemas/tools';
import { methodNotAllowed, readJson, toolResponse } from '$lib/server/http';

/** POST /api/v1/tools/supply — unloaded rail, ripple and average rail of a capacitor-input supply (API.md). */
export const POST: RequestHandler = async ({ request }) => {
	const body = await readJson(request);
	if (!body.ok) return body.response;
	return toolResponse(supplyToolInput, body.body, (input) => supplyRails(input));
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
