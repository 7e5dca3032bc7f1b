import { error, json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireEditableBuild } from '$lib/server/builds';
import { uploadRoute } from '$lib/server/http';
import { getObject } from '$lib/server/photos';
import { attachmentForDownload, contentDispositionFor, removeBuildAttachment } from '$lib/server/attachments';
import { actorOf } from '$lib/server/actor';

/**
 * Download one attached file: always `Content-Disposition: attachment` (never shown inline), `nosniff`,
 * and a sandboxing CSP in case a browser opens it anyway. A draft's files only for those who may see the
 * draft; anything else (no such file, another build's file, a draft of someone else) is 404.
 */
export const GET: RequestHandler = async ({ params, locals }) => {
	const found = await attachmentForDownload(params.slug, params.id, actorOf(locals.user));
	if (!found) error(404, 'Not found');
	const obj = await getObject(found.row.key);
	if (!obj || obj === 'not-modified') error(404, 'Not found');
	const headers = new Headers({
		'content-type': found.row.mime,
		'content-disposition': contentDispositionFor(found.row.name),
		'x-content-type-options': 'nosniff',
		'content-security-policy': "default-src 'none'; sandbox",
		'cache-control': found.cacheControl
	});
	if (found.cacheControl.startsWith('private')) headers.set('vary', 'Cookie');
	if (obj.contentLength !== undefined) headers.set('content-length', String(obj.contentLength));
	if (obj.etag) headers.set('etag', obj.etag);
	return new Response(obj.body, { headers });
};

/** Remove one attached file (its row, then its object). The maker or an admin only. */
export const DELETE: RequestHandler = async ({ params, request }) =>
	uploadRoute(request, async () => {
		const { actor, build } = await requireEditableBuild(params.slug);
		return json({ deleted: (await removeBuildAttachment(actor, build, params.id)).id });
	});
