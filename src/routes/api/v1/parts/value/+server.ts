import type { RequestHandler } from './$types';
import { readPartValue } from '$lib/parts';
import { partValueQuery } from '$lib/schemas/parts';
import { methodNotAllowed, queryObject, toolResponse } from '$lib/server/http';

/**
 * GET /api/v1/parts/value?text=…&kind=… — read a parts-list value exactly as the parts editor and the CSV import
 * do: "2×1u series" → 500 nF with the reading "two 1.00 µF in series = 500 nF"; "104" on a capacitor → 100 nF.
 * Unreadable or ambiguous (a bare "1u+1u" between capacitors) → 422 with a sentence naming both forms at `text`.
 */
export const GET: RequestHandler = ({ url }) => toolResponse(partValueQuery, queryObject(url), (q) => readPartValue(q.text, q.kind), 'text');

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['GET']);
