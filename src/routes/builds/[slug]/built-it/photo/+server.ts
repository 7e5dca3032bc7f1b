import { json, redirect } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireUser } from '$lib/server/auth';
import { actorOf } from '$lib/server/actor';
import { uploadCaller, uploadRoute } from '$lib/server/http';
import { consumeUpload, uploadLimitSentence } from '$lib/server/rate-limit';
import { PhotoError, checkAlt, photoMaxBytes } from '$lib/server/photos';
import { setBuiltItPhoto } from '$lib/server/built-it';

const FORM_OVERHEAD = 64 * 1024;

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
			const budget = await consumeUpload(actor.id);
			if (!budget.ok) throw new PhotoError(429, 'rate_limited', uploadLimitSentence(budget.retryAfterS), 'file');
			const max = photoMaxBytes();
			if (Number(request.headers.get('content-length') ?? 0) > max + FORM_OVERHEAD)
				throw new PhotoError(413, 'too_large', `The photo is larger than the ${Math.round(max / (1024 * 1024))} MB limit. Export it smaller and try again.`);
			if (!(request.headers.get('content-type') ?? '').startsWith('multipart/form-data'))
				throw new PhotoError(415, 'invalid', 'Send the photo as a form upload (multipart/form-data).', '');
			let form: FormData;
			try {
				form = await request.formData();
			} catch {
				throw new PhotoError(400, 'invalid', 'The upload arrived incomplete. Try again.', '');
			}
			const file = form.get('file');
			if (!(file instanceof File) || file.size === 0) throw new PhotoError(400, 'invalid', 'Choose a photo to upload.', 'file');
			const alt = checkAlt(form.get('alt'));
			await setBuiltItPhoto(actor, params.slug, new Uint8Array(await file.arrayBuffer()), alt);
			if (html) redirect(303, `/builds/${params.slug}#built-it`);
			return json({ ok: true }, { status: 201 });
		},
		{ htmlBack: html ? back : undefined, drainLimit: photoMaxBytes() + FORM_OVERHEAD }
	);
};
