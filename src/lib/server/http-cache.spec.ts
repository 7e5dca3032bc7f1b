import { describe, expect, it } from 'vitest';
import { cachePolicy, etagMatches, weakEtag, withValidators } from './http-cache';

describe('ETag and 304', () => {
	it('weak tag from the body: equal bodies, equal tags; different bodies, different tags', () => {
		expect(weakEtag('{"a":1}')).toBe(weakEtag(new TextEncoder().encode('{"a":1}')));
		expect(weakEtag('{"a":1}')).not.toBe(weakEtag('{"a":2}'));
		expect(weakEtag('x')).toMatch(/^W\/"[A-Za-z0-9_-]{27}"$/);
	});
	it('If-None-Match compares weakly and reads lists and *', () => {
		expect(etagMatches('W/"abc"', 'W/"abc"')).toBe(true);
		expect(etagMatches('"abc"', 'W/"abc"')).toBe(true);
		expect(etagMatches('"x", W/"abc"', 'W/"abc"')).toBe(true);
		expect(etagMatches('*', 'W/"abc"')).toBe(true);
		expect(etagMatches('W/"abd"', 'W/"abc"')).toBe(false);
		expect(etagMatches(null, 'W/"abc"')).toBe(false);
	});
	it('answers 200 with validators, then 304 without a body for the same tag', async () => {
		const make = () => new Response('{"items":[]}', { headers: { 'content-type': 'application/json' } });
		const first = await withValidators(new Request('http://x/api/v1/builds'), make(), 'public, max-age=60');
		expect(first.status).toBe(200);
		expect(await first.text()).toBe('{"items":[]}');
		const tag = first.headers.get('etag')!;
		expect(first.headers.get('cache-control')).toBe('public, max-age=60');
		expect(first.headers.get('vary')).toContain('Cookie');
		const again = await withValidators(new Request('http://x/api/v1/builds', { headers: { 'if-none-match': tag } }), make(), 'public, max-age=60');
		expect(again.status).toBe(304);
		expect(await again.text()).toBe('');
		expect(again.headers.get('etag')).toBe(tag);
		const changed = await withValidators(
			new Request('http://x/api/v1/builds', { headers: { 'if-none-match': tag } }),
			new Response('{"items":[1]}'),
			'public, max-age=60'
		);
		expect(changed.status).toBe(200);
		// Errors and writes pass through untouched.
		const err = new Response('{}', { status: 404 });
		expect(await withValidators(new Request('http://x/a'), err, 'p')).toBe(err);
	});
	it('policies: public reads short, comments revalidate, signed-in private, pages and ping not cached here', () => {
		expect(cachePolicy('/api/v1/builds', false)).toMatch(/^public, max-age=60/);
		expect(cachePolicy('/api/v1/builds/x/comments', false)).toBe('public, no-cache');
		expect(cachePolicy('/api/v1/builds', true)).toBe('private, no-cache');
		expect(cachePolicy('/api/v1/bench', false)).toBe('private, no-cache');
		expect(cachePolicy('/categories/dac/feed.xml', false)).toMatch(/^public/);
		expect(cachePolicy('/builds', false)).toBeNull();
		expect(cachePolicy('/api/v1/ping', false)).toBeNull();
	});
});
