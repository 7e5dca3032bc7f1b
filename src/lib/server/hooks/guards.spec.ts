import { describe, it, expect } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { handleRequestGuards, handleControlCharacters, checkedRequest, bodyCapFor } from './guards';
import { checkedBodyOf } from '../http/checked-body';
import { readJson } from '../http/envelope';
import { handleSecurityHeaders, HSTS } from './index';
import { cleanJson, cleanedSearch, stripControls } from '../http/control-chars';

const ORIGIN = 'http://127.0.0.1:3100';

function withOrigin(request: Request): Request {
	request.headers.set('origin', ORIGIN);
	return request;
}

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
		expect(chunked.seen).toBeNull();
		expect(((await chunked.response.json()) as { error: { message: string } }).error.message).toBe(
			'The request is too large: at most 64 KB is accepted here.'
		);
		// A declared length over the cap is refused before the body is read; a page gets the sentence as text.
		const declared = await run(
			handleRequestGuards,
			new Request(`${ORIGIN}/builds/x/edit`, {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded', origin: ORIGIN, 'content-length': String(300 * 1024) },
				body: 'a='.padEnd(300 * 1024, 'x')
			})
		);
		expect(declared.response.status).toBe(413);
		expect(await declared.response.text()).toBe('The request is too large: at most 256 KB is accepted here.');
		// Exactly at the cap passes, whole.
		const atCap = 'x'.repeat(64 * 1024 - 10);
		const fits = await run(
			handleRequestGuards,
			new Request(`${ORIGIN}/api/v1/reports`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ a: atCap }) })
		);
		expect((await readJson(fits.seen!.request)).ok && ((await readJson(fits.seen!.request)) as { body: { a: string } }).body.a).toBe(atCap);
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
			handleRequestGuards,
			new Request(`${ORIGIN}/builds/new`, {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded', origin: ORIGIN },
				body: 'title=Chip%00amp&summary=line%0Aone%01'
			})
		);
		const fd = await form.seen!.request.formData();
		expect(fd.get('title')).toBe('Chipamp');
		expect(fd.get('summary')).toBe('line\none');

		const multi = new FormData();
		multi.append('title', 'Tube\u0000 pre');
		multi.append('file', new File([new Uint8Array([0, 1, 2, 3])], 'x.bin'));
		const multiReq = new Request(`${ORIGIN}/builds/new`, { method: 'POST', body: multi });
		multiReq.headers.set('origin', ORIGIN);
		const m = await run(handleRequestGuards, multiReq);
		const mfd = await m.seen!.request.formData();
		expect(mfd.get('title')).toBe('Tube pre');
		expect(new Uint8Array(await (mfd.get('file') as File).arrayBuffer())).toEqual(new Uint8Array([0, 1, 2, 3]));

		const json = await run(
			handleRequestGuards,
			new Request(`${ORIGIN}/api/v1/builds/x/comments`, {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: '{"body":"fuse\\u0000 T2A","ti\\u0007tle":"a\u0001b"}'
			})
		);
		// Both ways a route may read it: the kept value (readJson) and the body itself.
		const read = await readJson(json.seen!.request);
		expect(read).toEqual({ ok: true, body: { body: 'fuse T2A', title: 'ab' } });
		expect(await json.seen!.request.json()).toEqual({ body: 'fuse T2A', title: 'ab' });
	});

	it('reads a body once and hands the route that text, not a clone of the original', async () => {
		const original = new Request(`${ORIGIN}/api/v1/spec-check`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: '{"kind":"amplifier","data":{"railV":28}}'
		});
		const { seen } = await run(handleRequestGuards, original);
		expect(seen!.request).not.toBe(original);
		// The original stream was read to its end once (a clone would have left it unread).
		expect(original.bodyUsed).toBe(true);
		expect(checkedBodyOf(seen!.request)).toEqual({ text: '{"kind":"amplifier","data":{"railV":28}}', json: { value: { kind: 'amplifier', data: { railV: 28 } } } });
		// Headers, method and URL go on; the length is the new body's own.
		expect(seen!.request.method).toBe('POST');
		expect(seen!.request.headers.get('content-type')).toBe('application/json');
		expect(seen!.request.url).toBe(original.url);
		expect(await seen!.request.text()).toBe('{"kind":"amplifier","data":{"railV":28}}');
	});

	it('leaves a body that is not JSON to the route, which answers 400 with a sentence', async () => {
		for (const body of ['{"body": "x"', '{"body":"a\u0000', 'not json']) {
			const { seen } = await run(
				handleRequestGuards,
				new Request(`${ORIGIN}/api/v1/builds/x/comments`, { method: 'POST', headers: { 'content-type': 'application/json' }, body })
			);
			expect(checkedBodyOf(seen!.request)?.json, body).toBeUndefined();
			const read = await readJson(seen!.request);
			expect(read.ok, body).toBe(false);
			if (!read.ok) expect(((await read.response.json()) as { error: { message: string } }).error.message).toBe('The body is not valid JSON.');
		}
	});

	it('a body that breaks off mid-read is a 400 with a sentence', async () => {
		const stream = new ReadableStream({
			start(c) {
				c.enqueue(new TextEncoder().encode('{"body":'));
				c.error(new Error('client went away'));
			}
		});
		const { response, seen } = await run(
			handleRequestGuards,
			new Request(`${ORIGIN}/api/v1/reports`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: stream, duplex: 'half' } as RequestInit)
		);
		expect(seen).toBeNull();
		expect(response.status).toBe(400);
		expect(((await response.json()) as { error: { message: string } }).error.message).toMatch(/arrived incomplete/);
	});

	it('upload routes keep their bytes: the guards do not read them', async () => {
		const multi = new FormData();
		multi.append('caption', 'a\u0000b');
		const original = new Request(`${ORIGIN}/builds/x/photos`, { method: 'POST', body: multi });
		original.headers.set('origin', ORIGIN);
		const { seen } = await run(handleRequestGuards, original);
		expect(seen!.request).toBe(original);
		expect(original.bodyUsed).toBe(false);
		expect((await seen!.request.formData()).get('caption')).toBe('a\u0000b');
	});

	it('a clean multipart form goes on byte for byte; other types unchanged', async () => {
		const body = '--b\r\nContent-Disposition: form-data; name="title"\r\n\r\nClass A\r\n--b--\r\n';
		const req = new Request(`${ORIGIN}/builds/new`, { method: 'POST', headers: { 'content-type': 'multipart/form-data; boundary=b' }, body });
		const checked = await checkedRequest(req, new TextEncoder().encode(body));
		expect(checked).not.toBe('unreadable');
		expect(await (checked as Request).text()).toBe(body);
		expect((checked as Request).headers.get('content-type')).toBe('multipart/form-data; boundary=b');
		const plain = await checkedRequest(new Request(`${ORIGIN}/x`, { method: 'POST', headers: { 'content-type': 'text/plain' }, body: 'a' }), new TextEncoder().encode('a\u0000'));
		expect(await (plain as Request).text()).toBe('a\u0000');
	});

	it('a multipart form that cannot be parsed (a raw line break in a file name) is a 400 with a sentence, never a 500', async () => {
		const body = '--b\r\nContent-Disposition: form-data; name="csvFile"; filename="one\r\ntwo.csv"\r\n\r\nx\r\n--b--\r\n';
		const req = () => new Request(`${ORIGIN}/builds/x/edit/parts?/import`, { method: 'POST', headers: { 'content-type': 'multipart/form-data; boundary=b' }, body });
		// What a form action would meet (RFC 7578 forbids the raw CR LF; undici refuses the body).
		await expect(req().formData()).rejects.toThrow();
		const { response, seen } = await run(handleRequestGuards, withOrigin(req()));
		expect(seen).toBeNull();
		expect(response.status).toBe(400);
		expect(await response.text()).toMatch(/arrived incomplete or malformed/);
	});
});
