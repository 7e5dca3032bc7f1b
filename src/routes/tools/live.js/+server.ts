import type { RequestHandler } from './$types';
import { LIVE_SCRIPT_BODY, LIVE_SCRIPT_VERSION } from '$lib/server/tools-live';

// The bench tools' live-update script. At its current version's address it never changes (kept a year);
// any other address answers the current text, revalidated each time.
export const GET: RequestHandler = ({ url, request }) => {
	const etag = `"${LIVE_SCRIPT_VERSION}"`;
	const headers = {
		'content-type': 'text/javascript; charset=utf-8',
		'cache-control': url.searchParams.get('v') === LIVE_SCRIPT_VERSION ? 'public, max-age=31536000, immutable' : 'public, no-cache',
		etag
	};
	if (request.headers.get('if-none-match') === etag) return new Response(null, { status: 304, headers });
	return new Response(LIVE_SCRIPT_BODY, { headers });
};
