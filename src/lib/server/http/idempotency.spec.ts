import { describe, it, expect } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { handleIdempotency } from './idempotency';

const ORIGIN = 'http://127.0.0.1:3100';

/** Send one request through the hook; the "route" counts its calls and answers 201 with a fresh id. */
function harness() {
	let calls = 0;
	const send = async (key: string | null, body: object, userId = 'idem-user', status = 201) => {
		const headers: Record<string, string> = { 'content-type': 'application/json' };
		if (key !== null) headers['idempotency-key'] = key;
		const request = new Request(`${ORIGIN}/api/v1/builds/x/comments`, { method: 'POST', headers, body: JSON.stringify(body) });
		const event = { request, url: new URL(request.url), locals: { user: { id: userId } }, getClientAddress: () => '10.9.8.7' } as unknown as RequestEvent;
		return handleIdempotency({
			event,
			resolve: async () => {
				calls++;
				return Response.json({ id: crypto.randomUUID() }, { status });
			}
		} as never);
	};
	return { send, calls: () => calls };
}

describe('Idempotency-Key on API writes', () => {
	it('answers a repeated request with the first answer and runs the write once', async () => {
		const h = harness();
		const key = `k-${crypto.randomUUID()}`;
		const first = await h.send(key, { body: 'T2A slow-blow' });
		const again = await h.send(key, { body: 'T2A slow-blow' });
		expect(first.status).toBe(201);
		expect(again.status).toBe(201);
		expect(again.headers.get('idempotent-replayed')).toBe('true');
		expect(await again.json()).toEqual(await first.json());
		expect(h.calls()).toBe(1);
	});

	it('refuses the same key on a different request (422), keeps keys apart per member, ignores requests without one', async () => {
		const h = harness();
		const key = `k-${crypto.randomUUID()}`;
		await h.send(key, { body: 'one' });
		expect((await h.send(key, { body: 'two' })).status).toBe(422);
		expect((await h.send(key, { body: 'one' }, 'another-member')).status).toBe(201);
		await h.send(null, { body: 'one' });
		await h.send(null, { body: 'one' });
		expect(h.calls()).toBe(4);
	});

	it('does not keep a 5xx answer, so the request can be sent again', async () => {
		const h = harness();
		const key = `k-${crypto.randomUUID()}`;
		expect((await h.send(key, { body: 'x' }, 'idem-user', 503)).status).toBe(503);
		expect((await h.send(key, { body: 'x' })).status).toBe(201);
		expect(h.calls()).toBe(2);
	});

	it('refuses a malformed key', async () => {
		const h = harness();
		expect((await h.send('with space', { body: 'x' })).status).toBe(400);
		expect((await h.send('x'.repeat(201), { body: 'x' })).status).toBe(400);
		expect(h.calls()).toBe(0);
	});
});
