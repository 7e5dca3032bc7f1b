import type { RequestHandler } from './$types';
import { nearestESeries } from '$lib/engineering';
import { eseriesQuery } from '$lib/schemas/tools';
import { methodNotAllowed, queryObject, toolResponse } from '$lib/server/http';

/** GET /api/v1/tools/eseries?value=…&series=E12 — nearest preferred value by ratio (API.md). */
export const GET: RequestHandler = ({ url }) =>
	toolResponse(eseriesQuery, queryObject(url), (q) => nearestESeries(q.value, q.series), 'value');

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['GET']);
