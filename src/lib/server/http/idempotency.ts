/**
 * `Idempotency-Key` on API writes: a client that did not get an answer (a timeout, the database
 * restarting) sends the same request again with the same key and gets the first answer back instead
 * of a second comment or report. Keys are kept per member (or per client address when signed out) for
 * 24 hours, with a fingerprint of the request: the same key on a different request is refused (422).
 * A 5xx answer is not kept, so a request that failed can be sent again.
 */
import type { Handle } from '@sveltejs/kit';
import { createHash } from 'node:crypto';
import { and, eq, lt, sql } from 'drizzle-orm';
import { db } from '../db';
import { idempotencyKey } from '../db/schema';
import { apiError } from './envelope';
import { checkedBodyOf } from './checked-body';

const WRITE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
/**
 * A first request still marked running after this long has died (its process, or the database under
 * it, went away before the mark could be removed): one connect timeout plus one statement timeout.
 */
const STALE_MS = 20_000;
const KEEP_HOURS = 24;

/** How long to keep trying to record the answer of a committed write while the database is away. */
const RECORD_RETRY_MS = 10_000;

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
		if (row && Date.now() - row.createdAt.getTime() < STALE_MS) {
			return apiError(409, 'conflict', 'The first request with this Idempotency-Key is still being handled. Try again in a moment.', [], {
				'retry-after': '1'
			});
		}
		// Gone (expired meanwhile) or stale: take it over.
		await db
			.insert(idempotencyKey)
			.values({ scope, key, fingerprint })
			.onConflictDoUpdate({ target: [idempotencyKey.scope, idempotencyKey.key], set: { fingerprint, status: null, body: null, createdAt: new Date() } });
	}

	const release = () =>
		db
			.delete(idempotencyKey)
			.where(and(eq(idempotencyKey.scope, scope), eq(idempotencyKey.key, key)))
			.catch(() => undefined);
	let response: Response;
	try {
		response = await resolve(event);
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
	// giving up (RECORD_RETRY_MS in all, within the request's time budget).
	const started = Date.now();
	for (let delay = 250; ; delay *= 2) {
		try {
			await db
				.update(idempotencyKey)
				.set({ status: response.status, body: text, contentType: response.headers.get('content-type') })
				.where(and(eq(idempotencyKey.scope, scope), eq(idempotencyKey.key, key)));
			break;
		} catch (err) {
			if (Date.now() - started + delay > RECORD_RETRY_MS) {
				// The write itself succeeded; only its record did not. The answer still goes out.
				console.error('[idempotency] could not keep the answer', (err as Error).message);
				break;
			}
			await new Promise((r) => setTimeout(r, delay));
		}
	}
	return response;
};
