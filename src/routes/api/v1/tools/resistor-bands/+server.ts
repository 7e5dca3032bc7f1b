import type { RequestHandler } from './$types';
import { bandsFromValue, formatValue, valueFromBands } from '$lib/engineering';
import { resistorBandsColorsQuery, resistorBandsValueQuery } from '$lib/schemas/tools';
import { apiError, methodNotAllowed, queryObject, toolResponse } from '$lib/server/http';

/**
 * GET /api/v1/tools/resistor-bands — `?valueOhm=4700&tolerancePct=5&bands=4` → { bands, valueOhm, tolerancePct };
 * `?colors=brown,black,orange,gold` → { valueOhm, tolerancePct, display, ambiguous?, reversed? } (API.md).
 */
export const GET: RequestHandler = ({ url }) => {
	const query = queryObject(url);
	const hasColors = 'colors' in query;
	const hasValue = 'valueOhm' in query;
	if (hasColors === hasValue)
		return apiError(400, 'invalid', 'Give either valueOhm or colors.', [
			{ path: hasColors ? 'colors' : 'valueOhm', message: hasColors ? 'give valueOhm or colors, not both' : 'required (or give colors)' }
		]);
	if (hasColors)
		return toolResponse(resistorBandsColorsQuery, query, (q) => {
			const reading = valueFromBands(q.colors);
			return { ...reading, display: formatValue(reading.valueOhm, 'ohm') };
		}, 'colors');
	return toolResponse(resistorBandsValueQuery, query, (q) => {
		const bands = bandsFromValue(q.valueOhm, q.tolerancePct, q.bands);
		const tolerancePct = q.tolerancePct ?? (q.bands === 5 ? 1 : q.bands === 4 ? 5 : 20);
		return { bands, valueOhm: q.valueOhm, tolerancePct };
	}, 'valueOhm');
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['GET']);
