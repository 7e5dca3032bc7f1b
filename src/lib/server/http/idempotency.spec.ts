import { describe, it, expect, vi, afterEach } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { and, eq, sql } from 'drizzle-orm';
import { handleIdempotency, idempotencyTiming } from './idempotency';
import { db } from '../db';
import { inTx } from '../db/tx';
import { idempotencyKey } from '../db/schema';

const ORIGIN = 'http://127.0.0.1:3100';

/** Send one request through the hook; the "route" counts its calls and answers 201 with a fresh id. */
function harness(route?: () => Promise<Response>) {
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
				return route ? route() : Response.json({ id: crypto.randomUUID() }, { status });
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

describe('a committed write is never carried out twice (PostgreSQL)', () => {
	const timing = { ...idempotencyTiming };
	afterEach(() => {
		Object.assign(idempotencyTiming, timing);
		vi.restoreAllMocks();
	});
	/** The route's write: a transaction through inTx, as postComment's insert. */
	const writingRoute = async () => {
		await inTx(undefined, async (tx) => {
			await tx.execute(sql`select 1`);
		});
		return Response.json({ id: crypto.randomUUID() }, { status: 201 });
	};
	const row = async (key: string) => (await db.select().from(idempotencyKey).where(and(eq(idempotencyKey.scope, 'user:idem-user'), eq(idempotencyKey.key, key))))[0];
	const age = (key: string, seconds: number) =>
		db.execute(sql`update idempotency_key set created_at = now() - make_interval(secs => ${seconds}) where scope = 'user:idem-user' and key = ${key}`);

	it('refuses to take over a key whose write committed but whose answer could not be kept', async () => {
		const h = harness(writingRoute);
		const key = `k-${crypto.randomUUID()}`;
		idempotencyTiming.recordRetryMs = 300;
		// The database "goes away" after the write: recording the answer fails for longer than recordRetryMs.
		const update = db.update.bind(db);
		const spy = vi.spyOn(db, 'update').mockImplementation(((table: typeof idempotencyKey) => {
			if (table === idempotencyKey) throw new Error('connection lost');
			return update(table);
		}) as typeof db.update);
		const first = await h.send(key, { body: 'fuse T2A' });
		spy.mockRestore();
		expect(first.status).toBe(201); // the write committed; its answer still goes out
		const kept = await row(key);
		expect(kept.status).toBeNull(); // the answer was not kept …
		expect(kept.writtenAt).not.toBeNull(); // … but the write's transaction marked the key
		// Long after the first request (past staleMs) the client sends it again: not carried out a second time.
		await age(key, idempotencyTiming.staleMs / 1000 + 5);
		const again = await h.send(key, { body: 'fuse T2A' });
		expect(again.status).toBe(409);
		expect(((await again.json()) as { error: { message: string } }).error.message).toMatch(/was carried out, but its answer could not be kept/);
		expect(h.calls()).toBe(1);
	});

	it('takes over a key whose first request died before writing anything', async () => {
		const h = harness(writingRoute);
		const key = `k-${crypto.randomUUID()}`;
		const { createHash } = await import('node:crypto');
		const fingerprint = createHash('sha256').update(`POST /api/v1/builds/x/comments\n${JSON.stringify({ body: 'x' })}`).digest('base64url');
		await db.insert(idempotencyKey).values({ scope: 'user:idem-user', key, fingerprint });
		// Still running (not stale): asked to wait.
		expect((await h.send(key, { body: 'x' })).status).toBe(409);
		expect(h.calls()).toBe(0);
		await age(key, idempotencyTiming.staleMs / 1000 + 5);
		const taken = await h.send(key, { body: 'x' });
		expect(taken.status).toBe(201);
		expect(h.calls()).toBe(1);
		expect((await row(key)).status).toBe(201);
	});

	it('keeps the key of a request that failed (5xx) after its write committed', async () => {
		const h = harness(async () => {
			await writingRoute();
			return new Response('mail queue down', { status: 503 });
		});
		const key = `k-${crypto.randomUUID()}`;
		expect((await h.send(key, { body: 'y' })).status).toBe(503);
		await age(key, idempotencyTiming.staleMs / 1000 + 5);
		expect((await h.send(key, { body: 'y' })).status).toBe(409);
		expect(h.calls()).toBe(1);
	});
});
