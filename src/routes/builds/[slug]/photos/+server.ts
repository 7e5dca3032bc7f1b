import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { FieldError } from '$lib/server/http';
import { FORM_OVERHEAD, buildFileRoute, receiveUpload } from '$lib/server/http/file-routes';
import { addBuildPhoto, checkAlt, photoMaxBytes, toPhotoView } from '$lib/server/photos';
import { isUuid } from '$lib/uuid';

/**
 * Add a photo to a build: multipart `file`, `alt`, `purpose` ('cover' | 'step'), `stepId` (for a step).
 * Sent by XHR (answers `{ photo }` or the error envelope) or by a plain form (redirects back).
 */
export const POST: RequestHandler = (event) =>
	buildFileRoute(event, { drainLimit: photoMaxBytes() + FORM_OVERHEAD }, async ({ actor, build, answer }) => {
		const form = await receiveUpload(event.request, actor.id, { maxBytes: photoMaxBytes() });
		const purpose = form.get('purpose');
		if (purpose !== 'cover' && purpose !== 'step') {
			throw new FieldError(400, 'invalid', 'Say whether the photo is the cover or belongs to a step.', 'purpose');
		}
		const rawStep = form.get('stepId');
		let stepId: string | undefined;
		if (purpose === 'step') {
			if (!isUuid(rawStep)) throw new FieldError(400, 'invalid', 'Choose the step this photo belongs to.', 'stepId');
			stepId = rawStep;
		}
		const file = form.get('file');
		if (!(file instanceof File) || file.size === 0) throw new FieldError(400, 'invalid', 'Choose a photo to upload.', 'file');
		const alt = checkAlt(form.get('alt'));
		// The pipeline checks size, content and pixels again on the bytes themselves.
		const row = await addBuildPhoto(actor, build, { stepId, bytes: new Uint8Array(await file.arrayBuffer()), alt, asCover: purpose === 'cover' });
		return answer(json({ photo: toPhotoView(row) }, { status: 201 }));
	});
