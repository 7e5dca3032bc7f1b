import { db, type Db, type Tx } from './index';

/** A database handle for reads: the pool or an open transaction. */
export type DbLike = Db | Tx;

/**
 * Run `fn` in the caller's transaction when one is given (the seed, other domain modules), else in a
 * new one. Lets every write in this module be called either way.
 */
export function inTx<T>(tx: Tx | undefined, fn: (tx: Tx) => Promise<T>): Promise<T> {
	return tx ? fn(tx) : db.transaction(fn);
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
