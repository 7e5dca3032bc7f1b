import type { RequestHandler } from './$types';
import { supplyWorstCase } from '$lib/engineering';
import { supplyToolInput } from '$lib/schemas/tools';
import { methodNotAllowed, readJson, toolResponse } from '$lib/server/http';

/** POST /api/v1/tools/supply — rails of a capacitor-input supply, nominal and worst case (API.md; the same function as the supply block). */
export const POST: RequestHandler = async ({ request }) => {
	const body = await readJson(request);
	if (!body.ok) return body.response;
	return toolResponse(supplyToolInput, body.body, (input) => supplyWorstCase(input));
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
