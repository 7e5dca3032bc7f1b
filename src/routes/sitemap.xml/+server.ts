import { sitemapUrls, sitemapXml } from '$lib/server/feed';
import type { RequestHandler } from './$types';

/** GET /sitemap.xml — public pages, published builds and makers' profiles, with absolute URLs. */
export const GET: RequestHandler = async ({ url }) =>
	new Response(sitemapXml(await sitemapUrls(url.origin)), { headers: { 'content-type': 'application/xml; charset=utf-8' } });
