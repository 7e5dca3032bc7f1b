import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireEditableBuild } from '$lib/server/builds';
import { uploadRoute } from '$lib/server/http';
import { removeBuildPhoto } from '$lib/server/photos';

/** Delete one photo of a build (its row and stored renditions). The maker or an admin only. */
export const DELETE: RequestHandler = async ({ params, request }) =>
	uploadRoute(request, async () => {
		const { actor, build } = await requireEditableBuild(params.slug);
		return json({ deleted: await removeBuildPhoto(actor, build, params.id) });
	});
