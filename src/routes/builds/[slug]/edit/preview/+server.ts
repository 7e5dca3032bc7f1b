import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { renderStepMarkdown, requireEditableBuild } from '$lib/server/builds';
import { STEP_BODY_MAX } from '$lib/schemas/build';
import { apiError } from '$lib/server/http';

/**
 * The step editor's preview: POST form field `bodyMd` → `{ html }`, rendered exactly as a save would store
 * it (the one Markdown pipeline, sanitized; photo references resolved to this build's photos). The build's
 * maker or an admin only; nothing is stored.
 */
export const POST: RequestHandler = async ({ params, request }) => {
	const { build } = await requireEditableBuild(params.slug, { forView: true });
	const form = await request.formData().catch(() => null);
	const md = form?.get('bodyMd');
	if (typeof md !== 'string') return apiError(400, 'invalid', 'Send the step text as the form field bodyMd.', [{ path: 'bodyMd', message: 'is required' }]);
	if (md.length > STEP_BODY_MAX) {
		return apiError(422, 'invalid', `Keep a step under ${STEP_BODY_MAX.toLocaleString('en')} characters; split it into two.`, [{ path: 'bodyMd', message: 'is too long' }]);
	}
	return json({ html: await renderStepMarkdown(undefined, build.id, md) });
};
