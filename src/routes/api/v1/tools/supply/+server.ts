import type { RequestHandler } from './$types';
import { rectifierCurrents, supplyWorstCase } from '$lib/engineering';
import { supplyToolInput } from '$lib/schemas/tools';
import { methodNotAllowed, readJson, toolResponse } from '$lib/server/http';

/** POST /api/v1/tools/supply — rails of a capacitor-input supply, nominal and worst case, and the rectifier's currents at loadCurrentA (API.md; the same function as the supply block). */
export const POST: RequestHandler = async ({ request }) => {
	const body = await readJson(request);
	if (!body.ok) return body.response;
	return toolResponse(supplyToolInput, body.body, (input) => ({ ...supplyWorstCase(input), ...rectifierCurrents(input) }));
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
