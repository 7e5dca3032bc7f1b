import { describe, it, expect } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { handleRequestGuards, handleControlCharacters, cleanedRequest, bodyCapFor } from './guards';
import { handleSecurityHeaders, HSTS } from './index';
import { cleanJson, cleanedSearch, stripControls } from '../http/control-chars';

const ORIGIN = 'http://127.0.0.1:3100';

/** Run a hook with a minimal event; the route "answers" with what it received. */
async function run(hook: typeof handleRequestGuards, request: Request) {
	const event = { request, url: new URL(request.url) } as unknown as RequestEvent;
	let seen: { request: Request; url: URL } | null = null;
	const response = await hook({
		event,
		resolve: async (e: RequestEvent) => {
			seen = { request: e.request, url: e.url };
			return new Response('route', { headers: { 'content-type': 'text/html' } });
		}
	} as never);
	return { response, seen: seen as { request: Request; url: URL } | null };
}

describe('JSON API writes and body caps (hole 6)', () => {
	it('answers 415 for an API write that is not application/json, in the envelope', async () => {
		for (const type of ['text/plain', 'application/x-www-form-urlencoded', 'multipart/form-data; boundary=x', '']) {
			const { response, seen } = await run(
				handleRequestGuards,
				new Request(`${ORIGIN}/api/v1/reports`, { method: 'POST', headers: { 'content-type': type, origin: ORIGIN }, body: '{}' })
			);
			expect(response.status, type).toBe(415);
			expect(seen).toBeNull();
			expect(((await response.json()) as { error: { code: string } }).error.code).toBe('invalid');
		}
		const ok = await run(
			handleRequestGuards,
			new Request(`${ORIGIN}/api/v1/reports`, { method: 'POST', headers: { 'content-type': 'application/json; charset=utf-8' }, body: '{}' })
		);
		expect(ok.seen).not.toBeNull();
	});

	it('answers 413 over 64 KB for the API, 256 KB for pages; uploads are left to their own limit', async () => {
		expect(bodyCapFor('/api/v1/builds/x/comments')).toBe(64 * 1024);
		expect(bodyCapFor('/builds/x/edit')).toBe(256 * 1024);
		expect(bodyCapFor('/builds/x/photos')).toBeNull();
		expect(bodyCapFor('/account/avatar')).toBeNull();
		const big = JSON.stringify({ body: 'x'.repeat(65 * 1024) });
		const { response } = await run(
			handleRequestGuards,
			new Request(`${ORIGIN}/api/v1/reports`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: big })
		);
		expect(response.status).toBe(413);
		expect(((await response.json()) as { error: { code: string; message: string } }).error).toMatchObject({ code: 'too_large' });
		// A chunked body (no Content-Length) is measured too.
		const stream = new ReadableStream({
			start(c) {
				for (let i = 0; i < 80; i++) c.enqueue(new TextEncoder().encode('x'.repeat(1024)));
				c.close();
			}
		});
		const chunked = await run(
			handleRequestGuards,
			new Request(`${ORIGIN}/api/v1/reports`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: stream, duplex: 'half' } as RequestInit)
		);
		expect(chunked.response.status).toBe(413);
	});

	it('refuses a cross-site form post, lets the RFC 8058 one-click unsubscribe through', async () => {
		const cross = await run(
			handleRequestGuards,
			new Request(`${ORIGIN}/builds/x/edit?/publish`, {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded', origin: 'https://evil.example' },
				body: 'a=1'
			})
		);
		expect(cross.response.status).toBe(403);
		const noOrigin = await run(
			handleRequestGuards,
			new Request(`${ORIGIN}/unsubscribe/one-click?token=x`, {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded' },
				body: 'List-Unsubscribe=One-Click'
			})
		);
		expect(noOrigin.seen).not.toBeNull();
	});
});

describe('HSTS (hole 7)', () => {
	it('is sent over https only', async () => {
		const https = await run(handleSecurityHeaders, new Request('https://starground.example/'));
		expect(https.response.headers.get('strict-transport-security')).toBe(HSTS);
		const http = await run(handleSecurityHeaders, new Request(`${ORIGIN}/`));
		expect(http.response.headers.get('strict-transport-security')).toBeNull();
	});
});

describe('control characters (12a)', () => {
	it('strip C0 controls and DEL but keep tab, LF and CR in text', () => {
		expect(stripControls('a\u0000b\u0001c\td\ne\rf\u007fg\u001b')).toBe('ab c\td\ne\rfg'.replace(' ', ''));
		expect(cleanJson({ 'ti\u0000tle': 'x\u0000y', list: ['\u0007z', 3, null] })).toEqual({ title: 'xy', list: ['z', 3, null] });
	});

	it('query strings lose them; a clean one is left alone', () => {
		expect(cleanedSearch(new URL(`${ORIGIN}/search?q=%00amp%01lifier`))).toBe('?q=amplifier');
		expect(cleanedSearch(new URL(`${ORIGIN}/search?q=amp`))).toBeNull();
	});

	it('a path holding one is a 404, never a 500', async () => {
		const { response, seen } = await run(handleControlCharacters, new Request(`${ORIGIN}/api/v1/builds/%00`));
		expect(response.status).toBe(404);
		expect(seen).toBeNull();
		expect(((await response.json()) as { error: { code: string } }).error.code).toBe('not_found');
	});

	it('form, multipart and JSON bodies reach the route without them', async () => {
		const form = await run(
			handleControlCharacters,
			new Request(`${ORIGIN}/builds/new`, {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded' },
				body: 'title=Chip%00amp&summary=line%0Aone%01'
			})
		);
		const fd = await form.seen!.request.formData();
		expect(fd.get('title')).toBe('Chipamp');
		expect(fd.get('summary')).toBe('line\none');

		const multi = new FormData();
		multi.append('title', 'Tube\u0000 pre');
		multi.append('file', new File([new Uint8Array([0, 1, 2, 3])], 'x.bin'));
		const m = await run(handleControlCharacters, new Request(`${ORIGIN}/builds/new`, { method: 'POST', body: multi }));
		const mfd = await m.seen!.request.formData();
		expect(mfd.get('title')).toBe('Tube pre');
		expect(new Uint8Array(await (mfd.get('file') as File).arrayBuffer())).toEqual(new Uint8Array([0, 1, 2, 3]));

		const json = await run(
			handleControlCharacters,
			new Request(`${ORIGIN}/api/v1/builds/x/comments`, {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: '{"body":"fuse\\u0000 T2A"}'
			})
		);
		expect(await json.seen!.request.json()).toEqual({ body: 'fuse T2A' });
		expect(await cleanedRequest(new Request(`${ORIGIN}/x`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{"a":"b"}' }))).toBeNull();
	});

	it('a multipart form that cannot be parsed (a raw line break in a file name) is a 400 with a sentence, never a 500', async () => {
		const body = '--b\r\nContent-Disposition: form-data; name="csvFile"; filename="one\r\ntwo.csv"\r\n\r\nx\r\n--b--\r\n';
		const req = () => new Request(`${ORIGIN}/builds/x/edit/parts?/import`, { method: 'POST', headers: { 'content-type': 'multipart/form-data; boundary=b' }, body });
		// What a form action would meet (RFC 7578 forbids the raw CR LF; undici refuses the body).
		await expect(req().formData()).rejects.toThrow();
		const { response, seen } = await run(handleControlCharacters, req());
		expect(seen).toBeNull();
		expect(response.status).toBe(400);
		expect(await response.text()).toMatch(/arrived incomplete or malformed/);
	});
});
