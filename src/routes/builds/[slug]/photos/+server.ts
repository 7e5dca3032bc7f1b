import { json, redirect } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireEditableBuild } from '$lib/server/builds';
import { uploadCaller, uploadRoute } from '$lib/server/http';
import { consumeUpload, uploadLimitSentence } from '$lib/server/rate-limit';
import { PhotoError, addBuildPhoto, checkAlt, photoMaxBytes, toPhotoView } from '$lib/server/photos';
import { isUuid } from '$lib/uuid';

/** Multipart overhead allowed on top of the photo itself (boundaries, the alt text, the other fields). */
const FORM_OVERHEAD = 64 * 1024;

/**
 * Add a photo to a build: multipart `file`, `alt`, `purpose` ('cover' | 'step'), `stepId` (for a step).
 * Sent by XHR (answers `{ photo }` or the error envelope) or by a plain form (redirects back).
 */
export const POST: RequestHandler = async (event) => {
	const { request, params } = event;
	const { html, back } = uploadCaller(event, `/builds/${params.slug}/edit`);

	return uploadRoute(
		request,
		async () => {
			const { actor, build } = await requireEditableBuild(params.slug);
			const budget = await consumeUpload(actor.id);
			if (!budget.ok) throw new PhotoError(429, 'rate_limited', uploadLimitSentence(budget.retryAfterS), 'file');

			const max = photoMaxBytes();
			const declared = Number(request.headers.get('content-length') ?? 0);
			if (declared > max + FORM_OVERHEAD) {
				throw new PhotoError(413, 'too_large', `The photo is larger than the ${Math.round(max / (1024 * 1024))} MB limit. Export it smaller and try again.`);
			}
			if (!(request.headers.get('content-type') ?? '').startsWith('multipart/form-data')) {
				throw new PhotoError(415, 'invalid', 'Send the photo as a form upload (multipart/form-data).', '');
			}
			let form: FormData;
			try {
				form = await request.formData();
			} catch (err) {
				// adapter-node stops reading at BODY_SIZE_LIMIT (a body sent without Content-Length): that is "too large".
				const tooLarge = (e: unknown): boolean =>
					!!e && ((e as { status?: number }).status === 413 || /exceeds limit/i.test(String((e as Error).message ?? '')) || tooLarge((e as Error).cause));
				if (tooLarge(err)) {
					throw new PhotoError(413, 'too_large', `The photo is larger than the ${Math.round(max / (1024 * 1024))} MB limit. Export it smaller and try again.`);
				}
				throw new PhotoError(400, 'invalid', 'The upload arrived incomplete. Try again.', '');
			}

			const purpose = form.get('purpose');
			if (purpose !== 'cover' && purpose !== 'step') {
				throw new PhotoError(400, 'invalid', 'Say whether the photo is the cover or belongs to a step.', 'purpose');
			}
			const rawStep = form.get('stepId');
			let stepId: string | undefined;
			if (purpose === 'step') {
				if (!isUuid(rawStep)) throw new PhotoError(400, 'invalid', 'Choose the step this photo belongs to.', 'stepId');
				stepId = rawStep;
			}
			const file = form.get('file');
			if (!(file instanceof File) || file.size === 0) {
				throw new PhotoError(400, 'invalid', 'Choose a photo to upload.', 'file');
			}
			const alt = checkAlt(form.get('alt'));
			// The pipeline checks size, content and pixels again on the bytes themselves.
			const row = await addBuildPhoto(actor, build, {
				stepId,
				bytes: new Uint8Array(await file.arrayBuffer()),
				alt,
				asCover: purpose === 'cover'
			});
			if (html) redirect(303, back);
			return json({ photo: toPhotoView(row) }, { status: 201 });
		},
		{ htmlBack: html ? back : undefined, drainLimit: photoMaxBytes() + FORM_OVERHEAD }
	);
};
