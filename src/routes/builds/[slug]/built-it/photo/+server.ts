import { json, redirect } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireUser } from '$lib/server/auth';
import { actorOf } from '$lib/server/actor';
import { FieldError, uploadCaller, uploadRoute } from '$lib/server/http';
import { FORM_OVERHEAD, receiveUpload } from '$lib/server/http/file-routes';
import { checkAlt, photoMaxBytes } from '$lib/server/photos';
import { setBuiltItPhoto } from '$lib/server/built-it';

/**
 * The photo of the member's "I built this too" record: multipart `file` and `alt`. A plain form is sent back to the
 * build page; a script gets `{ ok: true }` or the error envelope. Same limits and pipeline as build photos.
 */
export const POST: RequestHandler = async (event) => {
	const { request, params } = event;
	const { html, back } = uploadCaller(event, `/builds/${params.slug}/built-it`);
	return uploadRoute(
		request,
		async () => {
			const actor = actorOf(requireUser())!;
			const form = await receiveUpload(request, actor.id, { maxBytes: photoMaxBytes() });
			const file = form.get('file');
			if (!(file instanceof File) || file.size === 0) throw new FieldError(400, 'invalid', 'Choose a photo to upload.', 'file');
			const alt = checkAlt(form.get('alt'));
			await setBuiltItPhoto(actor, params.slug, new Uint8Array(await file.arrayBuffer()), alt);
			if (html) redirect(303, `/builds/${params.slug}#built-it`);
			return json({ ok: true }, { status: 201 });
		},
		{ htmlBack: html ? back : undefined, drainLimit: photoMaxBytes() + FORM_OVERHEAD }
	);
};
