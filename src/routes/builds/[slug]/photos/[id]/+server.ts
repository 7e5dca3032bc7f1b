import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { deleteBuildPhoto, photoRoute } from '$lib/server/photo-http';

/** Delete one photo of a build (its row and stored renditions). The maker or an admin only. */
export const DELETE: RequestHandler = async ({ params, request }) =>
	photoRoute(request, async () => json({ deleted: await deleteBuildPhoto(params.slug, params.id) }));
