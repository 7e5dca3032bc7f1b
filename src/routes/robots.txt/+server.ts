import type { RequestHandler } from './$types';

/** GET /robots.txt — crawl everything but the API and private pages; the sitemap's absolute URL comes from ORIGIN. */
export const GET: RequestHandler = ({ url }) =>
	new Response(
		[
			'User-agent: *',
			'Allow: /',
			'Allow: /api/docs',
			'Disallow: /api/',
			'Disallow: /bench',
			'Disallow: /search',
			'Disallow: /account',
			'Disallow: /review-desk',
			'Disallow: /moderation',
			'Disallow: /admin/',
			`Sitemap: ${url.origin}/sitemap.xml`,
			''
		].join('\n'),
		{ headers: { 'content-type': 'text/plain; charset=utf-8', 'cache-control': 'public, max-age=3600' } }
	);
