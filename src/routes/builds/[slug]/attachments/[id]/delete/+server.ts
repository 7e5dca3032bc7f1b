import { json, redirect } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireEditableBuild } from '$lib/server/builds';
import { uploadCaller, uploadRoute } from '$lib/server/http';
import { removeBuildAttachment } from '$lib/server/attachments';

/** Remove one attached file from a plain form (redirects back) or by fetch (answers JSON). The maker or an admin only. */
export const POST: RequestHandler = async (event) => {
	const { request, params } = event;
	const { html, back } = uploadCaller(event, `/builds/${params.slug}/edit`);
	return uploadRoute(
		request,
		async () => {
			const { actor, build } = await requireEditableBuild(params.slug);
			const deleted = (await removeBuildAttachment(actor, build, params.id)).id;
			if (html) redirect(303, back);
			return json({ deleted });
		},
		{ refusalTitle: 'File not changed', htmlBack: html ? back : undefined }
	);
};
