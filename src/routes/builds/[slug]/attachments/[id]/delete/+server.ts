import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { buildFileRoute } from '$lib/server/http/file-routes';
import { removeBuildAttachment } from '$lib/server/attachments';

/** Remove one attached file from a plain form (redirects back) or by fetch (answers JSON). The maker or an admin only. */
export const POST: RequestHandler = (event) =>
	buildFileRoute(event, { refusalTitle: 'File not changed' }, async ({ actor, build, answer }) =>
		answer(json({ deleted: (await removeBuildAttachment(actor, build, event.params.id)).id }))
	);
