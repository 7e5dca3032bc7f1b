// The server entry's answer to a request Node's HTTP server cannot read (scripts/lib/client-error.js, attached by
// server.js): a 10,000-character query string of hostile Unicode, percent-encoded (tests/fixtures/hostile-text.ts), is
// larger than Node's header limit (`http.maxHeaderSize`, 16 KB by default — Node's documentation, "--max-http-header-size").
// Node's own answer, checked first as the oracle, is 431 with an empty body; ours is the same 431 with a sentence (a JSON
// error envelope for /api/ addresses), and requests Node can read still reach the app.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import net from 'node:net';
import { HOSTILE_TEXT, percentEncode } from '../fixtures/hostile-text';
import { apiCodeFor, clientErrorReply, onClientError } from '../../scripts/lib/client-error.js';
import { codeForStatus } from '../../src/lib/server/http/envelope';

const servers: http.Server[] = [];

/** A server answering 200 "reached the app" to what it can read; with our clientError listener when `ours`. */
async function serve(ours: boolean): Promise<number> {
	const srv = http.createServer((_req, res) => res.end('reached the app'));
	if (ours) srv.on('clientError', onClientError);
	servers.push(srv);
	await new Promise<void>((r) => srv.listen(0, '127.0.0.1', r));
	return (srv.address() as net.AddressInfo).port;
}

/**
 * Send raw bytes — in chunks of `chunk` bytes `gapMs` apart when given, as a client on a real network does — and read
 * the whole answer until the server closes: → { status, headers, body }. A reset connection (the answer lost) fails.
 */
function raw(port: number, request: string, chunk = 0, gapMs = 0): Promise<{ status: number; headers: string; body: string }> {
	return new Promise((resolve, reject) => {
		const s = net.connect(port, '127.0.0.1');
		const chunks: Buffer[] = [];
		s.on('data', (d) => chunks.push(d));
		s.on('error', reject);
		s.on('end', () => s.end());
		s.on('close', () => {
			const text = Buffer.concat(chunks).toString('utf8');
			const [head, ...rest] = text.split('\r\n\r\n');
			resolve({ status: Number(/^HTTP\/1\.1 (\d{3})/.exec(head)?.[1] ?? 0), headers: head, body: rest.join('\r\n\r\n') });
		});
		const bytes = Buffer.from(request, 'latin1');
		if (!chunk) return void s.write(bytes);
		let at = 0;
		const next = () => {
			if (at >= bytes.length || s.destroyed || s.writableEnded) return;
			s.write(bytes.subarray(at, (at += chunk)), () => setTimeout(next, gapMs));
		};
		next();
	});
}

const get = (path: string) => `GET ${path} HTTP/1.1\r\nHost: 127.0.0.1\r\nConnection: close\r\n\r\n`;
const tenThousand = HOSTILE_TEXT.find((h) => h.name === '10,000 characters')!;
const longQuery = `/search?q=${tenThousand.form ?? percentEncode(tenThousand.text)}`;

let nodes: number, ours: number;
beforeAll(async () => {
	nodes = await serve(false);
	ours = await serve(true);
});
afterAll(async () => {
	await Promise.all(servers.map((s) => new Promise((r) => s.close(r))));
});

describe('a request Node cannot read gets a sentence', () => {
	it('the hostile query string is over the header limit: Node alone answers 431 with an empty body', async () => {
		// 'Ω' is two bytes in UTF-8, six characters percent-encoded: 60,000 bytes, over 16 KB (16,384).
		expect(longQuery.length).toBeGreaterThan(http.maxHeaderSize);
		const r = await raw(nodes, get(longQuery));
		expect(r.status).toBe(431);
		expect(r.body).toBe('');
	});

	it('with our listener: the same 431, with a plain sentence naming the limit', async () => {
		const r = await raw(ours, get(longQuery));
		expect(r.status).toBe(431);
		expect(r.headers).toMatch(/\r\ncontent-type: text\/plain; charset=utf-8/i);
		expect(r.headers).toMatch(/\r\nconnection: close/i);
		expect(r.body.trim()).toBe(clientErrorReply('HPE_HEADER_OVERFLOW').message);
		expect(r.body).toMatch(/too long: the server reads at most 16 KB/);
		expect(Number(/content-length: (\d+)/i.exec(r.headers)?.[1])).toBe(Buffer.byteLength(r.body));
	});

	it('on a kept-alive connection that already carried an answer, the long request still gets its sentence', async () => {
		const r = await new Promise<string>((resolve, reject) => {
			const s = net.connect(ours, '127.0.0.1');
			let got = '';
			s.on('error', reject);
			s.on('data', (d) => {
				got += d.toString('utf8');
				// The first answer is in: now the long request on the same connection.
				if (got.includes('reached the app') && !s.writableEnded && !got.includes(' 431 ')) {
					if (!(s as net.Socket & { sentLong?: boolean }).sentLong) {
						(s as net.Socket & { sentLong?: boolean }).sentLong = true;
						s.write(`GET ${longQuery} HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n`);
					}
				}
			});
			s.on('end', () => s.end());
			s.on('close', () => resolve(got));
			s.write('GET /search?q=rail HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n');
		});
		expect(r).toMatch(/^HTTP\/1\.1 200 OK/);
		expect(r).toContain('reached the app');
		const second = r.slice(r.indexOf('HTTP/1.1 431'));
		expect(second).toMatch(/^HTTP\/1\.1 431 Request Header Fields Too Large/);
		expect(second.split('\r\n\r\n')[1].trim()).toBe(clientErrorReply('HPE_HEADER_OVERFLOW').message);
	});

	it('sent in 2 KB chunks 5 ms apart, the client still gets the whole answer (no reset while it is sending)', async () => {
		for (let i = 0; i < 3; i++) {
			const r = await raw(ours, get(longQuery), 2048, 5);
			expect(r.status).toBe(431);
			expect(r.body.trim()).toBe(clientErrorReply('HPE_HEADER_OVERFLOW').message);
		}
	});

	it('an /api/ address gets the JSON error envelope; every other text of hostile-text.ts is refused the same way or reaches the app', async () => {
		const api = await raw(ours, get(`/api/v1/builds?q=${percentEncode(tenThousand.text)}`));
		expect(api.status).toBe(431);
		expect(JSON.parse(api.body)).toEqual({ error: { code: 'too_large', message: clientErrorReply('HPE_HEADER_OVERFLOW').message, issues: [] } });
		for (const h of HOSTILE_TEXT) {
			const r = await raw(ours, get(`/search?q=${h.form ?? percentEncode(h.text)}`));
			if (r.status === 431) expect(r.body.length, h.name).toBeGreaterThan(20);
			else expect([r.status, r.body], h.name).toEqual([200, 'reached the app']);
		}
	});

	it('bytes that are not HTTP: 400 with a sentence; a request Node can read still reaches the app', async () => {
		const bad = await raw(ours, 'NOT HTTP AT ALL\r\n\r\n');
		expect(bad.status).toBe(400);
		expect(bad.body.trim()).toBe('The server could not read this request: it is not well-formed HTTP.');
		const ok = await raw(ours, get('/search?q=rail'));
		expect([ok.status, ok.body]).toEqual([200, 'reached the app']);
	});
});

describe('the envelope code of a status server.js answers with', () => {
	// API.md: `too_large` for what was sent being too large (413; 431 is RFC 6585's "Request Header Fields Too
	// Large"), `invalid` for a request that cannot be read (400, and 408 as every other unlisted 4xx).
	it('is the same in client-error.js and in the app\'s status table (envelope.ts)', () => {
		expect(codeForStatus(431)).toBe('too_large');
		expect(codeForStatus(413)).toBe('too_large');
		for (const status of [400, 408, 431]) expect(apiCodeFor(status), String(status)).toBe(codeForStatus(status));
	});
});
