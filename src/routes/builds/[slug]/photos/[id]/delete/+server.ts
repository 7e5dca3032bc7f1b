import { json, redirect } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireEditableBuild } from '$lib/server/builds';
import { uploadCaller, uploadRoute } from '$lib/server/http';
import { removeBuildPhoto } from '$lib/server/photos';

/** Delete one photo from a plain form (redirects back) or by fetch (answers JSON). The maker or an admin only. */
export const POST: RequestHandler = async (event) => {
	const { request, params } = event;
	const { html, back } = uploadCaller(event, `/builds/${params.slug}/edit`);
	return uploadRoute(
		request,
		async () => {
			const { actor, build } = await requireEditableBuild(params.slug);
			const deleted = await removeBuildPhoto(actor, build, params.id);
			if (html) redirect(303, back);
			return json({ deleted });
		},
		{ htmlBack: html ? back : undefined }
	);
};
