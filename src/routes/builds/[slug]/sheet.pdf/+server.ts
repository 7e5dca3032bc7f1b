import type { RequestHandler } from './$types';
import { actorOf } from '$lib/server/actor';
import { loadBenchSheet, renderBenchSheetPdf } from '$lib/server/bench-sheet';

/** The bench sheet as a PDF download (the build as the viewer sees it; drafts only for those who may see them). */
export const GET: RequestHandler = async ({ params, locals, url }) => {
	const viewer = actorOf(locals.user);
	const sheet = await loadBenchSheet(params.slug, viewer, url.origin);
	const pdf = await renderBenchSheetPdf(sheet);
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `attachment; filename="${sheet.slug}-bench-sheet.pdf"`,
			'cache-control': 'private, no-store'
		}
	});
};
