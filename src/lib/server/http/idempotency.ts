/**
 * `Idempotency-Key` on API writes: a client that did not get an answer (a timeout, the database
 * restarting) sends the same request again with the same key and gets the first answer back instead
 * of a second comment or report. Keys are kept per member (or per client address when signed out) for
 * 24 hours, with a fingerprint of the request: the same key on a different request is refused (422).
 * A 5xx answer is not kept, so a request that failed before writing anything can be sent again.
 *
 * The write and the key commit together: every transaction the request opens through `inTx` also sets the
 * key's `written_at` (db/tx.ts `commitWith`). The answer itself is stored after the route has answered; if
 * that fails for good (the database away for longer than `recordRetryMs`), the key still says "written",
 * so a repeat is refused (409) instead of being carried out a second time — a key is only ever taken over
 * from a first request that died before its write committed.
 */
import type { Handle } from '@sveltejs/kit';
import { createHash } from 'node:crypto';
import { and, eq, isNull, lt, sql } from 'drizzle-orm';
import { db, type Tx } from '../db';
import { commitWith } from '../db/tx';
import { idempotencyKey } from '../db/schema';
import { apiError } from './envelope';
import { checkedBodyOf } from './checked-body';

const WRITE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
export const idempotencyTiming = {
	/**
	 * A first request still marked running after this long, with no write committed, has died (its process,
	 * or the database under it, went away before the mark could be removed): one connect timeout plus one
	 * statement timeout. Its key may be taken over.
	 */
	staleMs: 20_000,
	/** How long to keep trying to record the answer of a committed write while the database is away. */
	recordRetryMs: 10_000
};
const KEEP_HOURS = 24;

export const handleIdempotency: Handle = async ({ event, resolve }) => {
	const key = event.request.headers.get('idempotency-key');
	if (key === null || !WRITE.has(event.request.method) || !event.url.pathname.startsWith('/api/v1/')) return resolve(event);
	if (!/^[\x21-\x7e]{1,200}$/.test(key)) {
		return apiError(400, 'invalid', 'An Idempotency-Key is 1 to 200 visible ASCII characters.', [{ path: 'Idempotency-Key', message: 'malformed' }]);
	}
	const scope = event.locals.user ? `user:${event.locals.user.id}` : `address:${event.getClientAddress()}`;
	// The request guards read the body once and kept its text; only a body they did not read is read here.
	const checked = checkedBodyOf(event.request)?.text;
	const body = checked ?? (event.request.body ? await event.request.clone().text() : '');
	const fingerprint = createHash('sha256')
		.update(`${event.request.method} ${event.url.pathname}${event.url.search}\n${body}`)
		.digest('base64url');

	if (Math.random() < 0.02) {
		await db.delete(idempotencyKey).where(lt(idempotencyKey.createdAt, sql`now() - make_interval(hours => ${KEEP_HOURS})`));
	}
	const claimed = await db.insert(idempotencyKey).values({ scope, key, fingerprint }).onConflictDoNothing().returning({ key: idempotencyKey.key });
	if (claimed.length === 0) {
		const [row] = await db
			.select()
			.from(idempotencyKey)
			.where(and(eq(idempotencyKey.scope, scope), eq(idempotencyKey.key, key)));
		if (row && row.fingerprint !== fingerprint) {
			return apiError(422, 'invalid', 'This Idempotency-Key was already used for a different request. Use a new key for a new request.', [
				{ path: 'Idempotency-Key', message: 'reused for a different request' }
			]);
		}
		if (row && row.status !== null) {
			return new Response(row.body, {
				status: row.status,
				headers: { 'content-type': row.contentType ?? 'application/json', 'idempotent-replayed': 'true', 'cache-control': 'no-store' }
			});
		}
		if (row?.writtenAt) {
			return apiError(
				409,
				'conflict',
				'The first request with this Idempotency-Key was carried out, but its answer could not be kept. It is not carried out again: look up its result instead.'
			);
		}
		if (row && Date.now() - row.createdAt.getTime() < idempotencyTiming.staleMs) {
			return apiError(409, 'conflict', 'The first request with this Idempotency-Key is still being handled. Try again in a moment.', [], {
				'retry-after': '1'
			});
		}
		// Gone (expired meanwhile) or stale with nothing written: take it over — unless its write committed
		// or another retry took it over meanwhile (the update's condition is checked under the row's lock).
		const taken = await db
			.insert(idempotencyKey)
			.values({ scope, key, fingerprint })
			.onConflictDoUpdate({
				target: [idempotencyKey.scope, idempotencyKey.key],
				set: { fingerprint, status: null, body: null, createdAt: new Date() },
				setWhere: and(
					isNull(idempotencyKey.writtenAt),
					isNull(idempotencyKey.status),
					lt(idempotencyKey.createdAt, sql`now() - make_interval(secs => ${idempotencyTiming.staleMs / 1000})`)
				)
			})
			.returning({ key: idempotencyKey.key });
		if (taken.length === 0) {
			return apiError(409, 'conflict', 'The first request with this Idempotency-Key is still being handled. Try again in a moment.', [], {
				'retry-after': '1'
			});
		}
	}

	const thisKey = and(eq(idempotencyKey.scope, scope), eq(idempotencyKey.key, key));
	// Committed with the request's write, in its transaction (db/tx.ts inTx).
	const markWritten = async (tx: Tx) => {
		await tx.update(idempotencyKey).set({ writtenAt: sql`now()` }).where(thisKey);
	};
	// Free the key for a retry — unless a write of this request committed: that one must not run twice.
	const release = () =>
		db
			.delete(idempotencyKey)
			.where(and(thisKey, isNull(idempotencyKey.writtenAt)))
			.catch(() => undefined);
	let response: Response;
	try {
		response = await commitWith(markWritten, () => resolve(event));
	} catch (err) {
		await release();
		throw err;
	}
	if (response.status >= 500) {
		await release();
		return response;
	}
	const text = await response.clone().text();
	// The write is committed: its answer must be kept, or a retry with this key would repeat it. When the
	// database drops out just after the write (a restart takes a few seconds), try again for a while before
	// giving up (recordRetryMs in all, within the request's time budget).
	const started = Date.now();
	for (let delay = 250; ; delay *= 2) {
		try {
			await db
				.update(idempotencyKey)
				.set({ status: response.status, body: text, contentType: response.headers.get('content-type') })
				.where(thisKey);
			break;
		} catch (err) {
			if (Date.now() - started + delay > idempotencyTiming.recordRetryMs) {
				// The write itself succeeded; only its record did not. The answer still goes out, and the key
				// keeps saying "written" (if the write went through inTx), so a repeat is refused, not run.
				console.error('[idempotency] could not keep the answer', (err as Error).message);
				break;
			}
			await new Promise((r) => setTimeout(r, delay));
		}
	}
	return response;
};
