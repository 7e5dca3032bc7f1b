import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { buildFileRoute } from '$lib/server/http/file-routes';
import { removeBuildPhoto } from '$lib/server/photos';

/** Delete one photo from a plain form (redirects back) or by fetch (answers JSON). The maker or an admin only. */
export const POST: RequestHandler = (event) =>
	buildFileRoute(event, {}, async ({ actor, build, answer }) => answer(json({ deleted: await removeBuildPhoto(actor, build, event.params.id) })));
