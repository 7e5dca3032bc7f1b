import type { RequestHandler } from './$types';
import { amplifierOutput, stageWorstCase } from '$lib/engineering';
import { amplifierToolInput } from '$lib/schemas/tools';
import { methodNotAllowed, readJson, toolResponse } from '$lib/server/http';

/** POST /api/v1/tools/amplifier — maximum sine power and class B dissipation, nominal and worst case (API.md). */
export const POST: RequestHandler = async ({ request }) => {
	const body = await readJson(request);
	if (!body.ok) return body.response;
	return toolResponse(amplifierToolInput, body.body, (input) => {
		const w = stageWorstCase({ topology: 'class-ab-chip', ...input });
		return {
			...amplifierOutput(input),
			railLimitPowerW: w.railLimitPowerW,
			designDissipationW: w.designDissipationW,
			highMainsTotalV: w.highMainsTotalV,
			minImpedanceOhm: w.minImpedanceOhm,
			worstPeakCurrentA: w.worstPeakCurrentA
		};
	});
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST']);
