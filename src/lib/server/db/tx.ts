import { AsyncLocalStorage } from 'node:async_hooks';
import { db, type Db, type Tx } from './index';

/** A database handle for reads: the pool or an open transaction. */
export type DbLike = Db | Tx;

/** Work that commits with every transaction opened by inTx while it is set (see `commitWith`). */
const withEveryTx = new AsyncLocalStorage<(tx: Tx) => Promise<void>>();

/**
 * Run `fn` (a request's handling) so that every transaction inTx opens inside it also runs `work` just before
 * it commits — in the same transaction, so the two commit together or not at all. The Idempotency-Key
 * (http/idempotency.ts) marks its key "written" this way.
 */
export function commitWith<T>(work: (tx: Tx) => Promise<void>, fn: () => T): T {
	return withEveryTx.run(work, fn);
}

/**
 * Run `fn` in the caller's transaction when one is given (the seed, other domain modules), else in a
 * new one. Lets every write in this module be called either way. A new transaction also carries the
 * work set by `commitWith`, if any.
 */
export function inTx<T>(tx: Tx | undefined, fn: (tx: Tx) => Promise<T>): Promise<T> {
	if (tx) return fn(tx);
	const work = withEveryTx.getStore();
	if (!work) return db.transaction(fn);
	return db.transaction(async (t) => {
		const result = await fn(t);
		await work(t);
		return result;
	});
}

/** The SQLSTATE of a PostgreSQL error, also when the ORM wrapped it. '23505' = unique violation. */
export function pgCode(e: unknown): string | undefined {
	let cur: unknown = e;
	for (let depth = 0; cur && depth < 4; depth++) {
		const code = (cur as { code?: unknown }).code;
		if (typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code)) return code;
		cur = (cur as { cause?: unknown }).cause;
	}
	return undefined;
}
