import { redirect } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/**
 * Hazard tags moved from /builds/[slug]/flags/[id] to /builds/[slug]/hazards/[id]. Links in mail sent
 * before the move keep working: 308 keeps the method and body, so an old form post lands on the same action.
 */
const moved: RequestHandler = ({ params, url }) => {
	redirect(308, `/builds/${encodeURIComponent(params.slug)}/hazards/${encodeURIComponent(params.id)}${url.search}`);
};

export const GET = moved;
export const HEAD = moved;
export const POST = moved;
