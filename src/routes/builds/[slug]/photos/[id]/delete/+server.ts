import { json, redirect } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { backTo, deleteBuildPhoto, photoRoute, wantsHtml } from '$lib/server/photo-http';

/** Delete one photo from a plain form (redirects back) or by fetch (answers JSON). The maker or an admin only. */
export const POST: RequestHandler = async ({ params, request, locals, url }) => {
	const html = wantsHtml(request);
	const back = backTo(request, url.origin, `/builds/${params.slug}/edit`);
	if (!locals.user && html) redirect(303, `/sign-in?next=${encodeURIComponent(back)}`);
	return photoRoute(
		request,
		async () => {
			const deleted = await deleteBuildPhoto(params.slug, params.id);
			if (html) redirect(303, back);
			return json({ deleted });
		},
		{ htmlBack: html ? back : undefined }
	);
};
