import { error } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { getObject } from '$lib/server/photos';
import { mediaAccess } from '$lib/server/photos/media-access';
import { actorOf } from '$lib/server/actor';

/** Only these stored folders are public; keys are plain path segments (no '..', no empty parts). */
const PUBLIC_KEY = /^(photos|avatars)\/[A-Za-z0-9_-][A-Za-z0-9._-]*(\/[A-Za-z0-9_-][A-Za-z0-9._-]*)*$/;
const TYPES: Record<string, string> = { webp: 'image/webp', jpg: 'image/jpeg', jpeg: 'image/jpeg', png: 'image/png', avif: 'image/avif' };

/**
 * Stream a stored image to those who may see it (see media-access.ts): photos of drafts privately,
 * published ones and avatars cacheable for a year (a new upload gets a new key); a matching
 * If-None-Match gets 304. Objects without a row are not served.
 */
export const GET: RequestHandler = async ({ params, request, locals }) => {
	const key = params.key;
	if (!PUBLIC_KEY.test(key) || key.split('/').some((part) => part === '..' || part === '.')) error(404, 'Not found');
	const access = await mediaAccess(key, actorOf(locals.user));
	if (!access.ok) error(404, 'Not found');
	const obj = await getObject(key, { ifNoneMatch: request.headers.get('if-none-match') ?? undefined });
	const cache = access.cacheControl;
	if (obj === 'not-modified') {
		return new Response(null, { status: 304, headers: { 'cache-control': cache, etag: request.headers.get('if-none-match')! } });
	}
	if (!obj) error(404, 'Not found');

	// Serve only raster image types; anything else (never expected) is sent as an opaque download.
	const ext = key.slice(key.lastIndexOf('.') + 1).toLowerCase();
	const stored = obj.contentType ?? '';
	const type = /^image\/(webp|jpeg|png|avif)$/.test(stored) ? stored : (TYPES[ext] ?? 'application/octet-stream');
	const headers = new Headers({ 'content-type': type, 'cache-control': cache });
	if (cache.startsWith('private')) headers.set('vary', 'Cookie');
	if (obj.etag) headers.set('etag', obj.etag);
	if (obj.contentLength !== undefined) headers.set('content-length', String(obj.contentLength));
	if (obj.lastModified) headers.set('last-modified', obj.lastModified.toUTCString());
	if (type === 'application/octet-stream') headers.set('content-disposition', 'attachment');
	return new Response(obj.body, { headers });
};
