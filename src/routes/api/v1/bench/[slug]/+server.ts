import { json } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth';
import { methodNotAllowed } from '$lib/server/http';
import { setOnBench } from '$lib/server/bench';
import type { RequestHandler } from './$types';

/** POST /api/v1/bench/:slug — save a published build to the member's bench (idempotent): { slug, saved: true }. */
export const POST: RequestHandler = async ({ params }) => {
	const user = requireUser();
	return json(await setOnBench(user.id, params.slug, true));
};

/** DELETE /api/v1/bench/:slug — take a build off the member's bench (idempotent): { slug, saved: false }. */
export const DELETE: RequestHandler = async ({ params }) => {
	const user = requireUser();
	return json(await setOnBench(user.id, params.slug, false));
};

/** Any other method → 405 method_not_allowed. */
export const fallback: RequestHandler = () => methodNotAllowed(['POST', 'DELETE']);
