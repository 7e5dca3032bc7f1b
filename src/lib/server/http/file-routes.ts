/**
 * The plumbing the file routes of a build share (photos, attachments, the "I built this too" photo): who is
 * calling (plain form or script), the editable-build guard, the member's upload budget, the declared size,
 * reading the multipart form, and answering a refusal as a page or as the envelope. Kept apart from the
 * `http` index because it needs the builds guard and the rate limiter (which themselves use `http`).
 */
import { redirect } from '@sveltejs/kit';
import { requireEditableBuild } from '../builds';
import { consumeUpload, uploadLimitSentence } from '../rate-limit';
import type { Actor } from '../actor';
import type * as schema from '../db/schema';
import { FieldError, readUploadForm, uploadCaller, uploadRoute, uploadTooLarge } from './upload';

/** Multipart overhead allowed on top of the file itself (boundaries, the name, the other fields). */
export const FORM_OVERHEAD = 64 * 1024;

/**
 * Everything an upload checks before the route reads its own fields, in this order: the member's upload
 * budget (429), the declared Content-Length against `maxBytes` + overhead (413), then the multipart form
 * itself (415 not multipart, 413 cut off at the body limit, 400 incomplete, 400 two files in `field`).
 * `tooLarge` replaces the generic "larger than the … limit" sentence.
 */
export async function receiveUpload(
	request: Request,
	memberId: string,
	spec: { maxBytes: number; what?: string; field?: string; tooLarge?: () => FieldError }
): Promise<FormData> {
	const { maxBytes, what = 'photo', field = 'file' } = spec;
	const budget = await consumeUpload(memberId);
	if (!budget.ok) throw new FieldError(429, 'rate_limited', uploadLimitSentence(budget.retryAfterS), field);
	const tooLarge = spec.tooLarge ?? (() => uploadTooLarge(maxBytes, what));
	if (Number(request.headers.get('content-length') ?? 0) > maxBytes + FORM_OVERHEAD) throw tooLarge();
	try {
		return await readUploadForm(request, field, maxBytes, what);
	} catch (err) {
		if (err instanceof FieldError && err.status === 413 && spec.tooLarge) throw spec.tooLarge();
		throw err;
	}
}

type BuildFileEvent = { request: Request; url: URL; locals: App.Locals; params: { slug: string } };

/**
 * A POST that changes a build's files, sent by a plain no-JS form (redirected back, or a small refusal page)
 * or by a script (JSON, or the error envelope). Only the maker or an admin gets to `handler`; its `answer`
 * turns the JSON reply into the redirect a plain form wants. `drainLimit`: the largest body read and
 * discarded before a refusal (see uploadRoute).
 */
export function buildFileRoute(
	event: BuildFileEvent,
	opts: { refusalTitle?: string; drainLimit?: number },
	handler: (ctx: { actor: Actor; build: schema.Build; answer: (json: Response) => Response }) => Promise<Response>
): Promise<Response> {
	const { html, back } = uploadCaller(event, `/builds/${event.params.slug}/edit`);
	const answer = (json: Response): Response => {
		if (html) redirect(303, back);
		return json;
	};
	return uploadRoute(
		event.request,
		async () => {
			const { actor, build } = await requireEditableBuild(event.params.slug);
			return handler({ actor, build, answer });
		},
		{ ...opts, htmlBack: html ? back : undefined }
	);
}
