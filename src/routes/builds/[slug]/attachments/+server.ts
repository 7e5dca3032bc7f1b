import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { FORM_OVERHEAD, buildFileRoute, receiveUpload } from '$lib/server/http/file-routes';
import { AttachmentError, addBuildAttachment, attachmentMaxBytes, checkAttachmentSize, toAttachmentView } from '$lib/server/attachments';
import { formatBytes } from '$lib/attachments';

/**
 * Attach a file to a build: multipart `file` and `kind` (schematic, pcb, enclosure, other). Sent by XHR
 * (answers 201 `{ attachment }` or the error envelope) or by a plain form (redirects back). The maker or an admin only.
 */
export const POST: RequestHandler = (event) =>
	buildFileRoute(event, { refusalTitle: 'File not changed', drainLimit: attachmentMaxBytes() + FORM_OVERHEAD }, async ({ actor, build, answer }) => {
		const form = await receiveUpload(event.request, actor.id, {
			maxBytes: attachmentMaxBytes(),
			what: 'file',
			tooLarge: () =>
				new AttachmentError(413, 'too_large', `The file is larger than the ${formatBytes(attachmentMaxBytes())} limit. Split a large ZIP or export the drawing smaller.`)
		});
		const file = form.get('file');
		if (!(file instanceof File)) throw new AttachmentError(400, 'invalid', 'Choose the file to attach.', 'file');
		checkAttachmentSize(file.size);
		const row = await addBuildAttachment(actor, build, { bytes: new Uint8Array(await file.arrayBuffer()), name: file.name, kind: form.get('kind') });
		return answer(json({ attachment: toAttachmentView(row, build.slug) }, { status: 201 }));
	});
