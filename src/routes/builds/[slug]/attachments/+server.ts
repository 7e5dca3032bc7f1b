import { json, redirect } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { requireEditableBuild } from '$lib/server/builds';
import { uploadCaller, uploadRoute } from '$lib/server/http';
import { consumeUpload, uploadLimitSentence } from '$lib/server/rate-limit';
import { AttachmentError, addBuildAttachment, attachmentMaxBytes, checkAttachmentSize, toAttachmentView } from '$lib/server/attachments';
import { formatBytes } from '$lib/attachments';

/** Multipart overhead allowed on top of the file itself (boundaries, the name, the kind). */
const FORM_OVERHEAD = 64 * 1024;

/**
 * Attach a file to a build: multipart `file` and `kind` (schematic, pcb, enclosure, other). Sent by XHR
 * (answers 201 `{ attachment }` or the error envelope) or by a plain form (redirects back). The maker or an admin only.
 */
export const POST: RequestHandler = async (event) => {
	const { request, params } = event;
	const { html, back } = uploadCaller(event, `/builds/${params.slug}/edit`);
	const tooLarge = () => new AttachmentError(413, 'too_large', `The file is larger than the ${formatBytes(attachmentMaxBytes())} limit. Split a large ZIP or export the drawing smaller.`);
	return uploadRoute(
		request,
		async () => {
			const { actor, build } = await requireEditableBuild(params.slug);
			const budget = await consumeUpload(actor.id);
			if (!budget.ok) throw new AttachmentError(429, 'rate_limited', uploadLimitSentence(budget.retryAfterS), 'file');
			const declared = Number(request.headers.get('content-length') ?? 0);
			if (declared > attachmentMaxBytes() + FORM_OVERHEAD) throw tooLarge();
			if (!(request.headers.get('content-type') ?? '').startsWith('multipart/form-data')) {
				throw new AttachmentError(415, 'invalid', 'Send the file as a form upload (multipart/form-data).', '');
			}
			let form: FormData;
			try {
				form = await request.formData();
			} catch (err) {
				const over = (e: unknown): boolean =>
					!!e && ((e as { status?: number }).status === 413 || /exceeds limit/i.test(String((e as Error).message ?? '')) || over((e as Error).cause));
				if (over(err)) throw tooLarge();
				throw new AttachmentError(400, 'invalid', 'The upload arrived incomplete. Try again.', '');
			}
			const file = form.get('file');
			if (!(file instanceof File)) throw new AttachmentError(400, 'invalid', 'Choose the file to attach.', 'file');
			checkAttachmentSize(file.size);
			const row = await addBuildAttachment(actor, build, { bytes: new Uint8Array(await file.arrayBuffer()), name: file.name, kind: form.get('kind') });
			if (html) redirect(303, back);
			return json({ attachment: toAttachmentView(row, build.slug) }, { status: 201 });
		},
		{ refusalTitle: 'File not changed', htmlBack: html ? back : undefined, drainLimit: attachmentMaxBytes() + FORM_OVERHEAD }
	);
};
