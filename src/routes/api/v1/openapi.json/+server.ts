import { json } from '@sveltejs/kit';
import { methodNotAllowed } from '$lib/server/http';
import { openApiDocument } from '$lib/server/openapi';
import type { RequestHandler } from './$types';

/** GET /api/v1/openapi.json — the OpenAPI 3.1 document of this API, generated from the routes' zod schemas. */
export const GET: RequestHandler = ({ url }) => json(openApiDocument(url.origin));

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['GET']);
