import type { RequestHandler } from './$types';
import { decodeMarking } from '$lib/engineering';
import { decodeQuery } from '$lib/schemas/tools';
import { methodNotAllowed, queryObject, toolResponse } from '$lib/server/http';

/** GET /api/v1/tools/decode?code=…&as=… — read a component marking (API.md); undecodable → 422 at `code`. */
export const GET: RequestHandler = ({ url }) =>
	toolResponse(decodeQuery, queryObject(url), (q) => decodeMarking(q.code, q.as), 'code');

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['GET']);
