import { json, redirect } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireEditableBuild } from '$lib/server/builds';
import { readUploadForm, uploadCaller, uploadRoute, uploadTooLarge } from '$lib/server/http';
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
				throw uploadTooLarge(max);
			}
			const form = await readUploadForm(request, 'file', max);

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
