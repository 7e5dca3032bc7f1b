/**
 * Recognising "a service we depend on is not answering" — PostgreSQL down, restarting or too slow, the
 * object store unreachable — so the answer is 503 `unavailable` with Retry-After and a sentence, never a
 * 500 with a stack trace. Errors are recognised by their codes anywhere in the `cause` chain (drizzle,
 * better-auth and our own modules wrap the driver's error).
 */

export type Unavailable = 'database' | 'storage';

/** Seconds a client should wait before retrying (sent as Retry-After). */
export const RETRY_AFTER_S = 5;

/** postgres.js connection errors, and SQLSTATEs of a server going away, starting, overloaded or timing out. */
const DB_CODES = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'ETIMEDOUT',
	'EPIPE',
	'EHOSTUNREACH',
	'ENETUNREACH',
	'CONNECT_TIMEOUT',
	'CONNECTION_CLOSED',
	'CONNECTION_ENDED',
	'CONNECTION_DESTROYED',
	'57P01', // admin_shutdown
	'57P02', // crash_shutdown
	'57P03', // cannot_connect_now (starting up / shutting down)
	'53300', // too_many_connections
	'57014', // query_canceled (statement_timeout)
	'55P03', // lock_not_available (lock_timeout)
	'08000',
	'08003',
	'08006',
	'08001',
	'08004'
]);

/** Marks an error raised by the storage module when the object store cannot be reached. */
export class StorageUnavailableError extends Error {
	override name = 'StorageUnavailableError';
	constructor(cause: unknown) {
		super('The object store is not answering.', { cause });
	}
}

const STORAGE_NAMES = new Set(['TimeoutError', 'RequestTimeout', 'ServiceUnavailable', 'SlowDown', 'InternalError', 'NetworkingError']);

/** True for an error of the S3 client that means "the store is unreachable or failing", not "no such key". */
export function isStorageFailure(err: unknown): boolean {
	const e = err as { name?: string; code?: string; $metadata?: { httpStatusCode?: number }; cause?: unknown } | null;
	if (!e || typeof e !== 'object') return false;
	if (e.name && STORAGE_NAMES.has(e.name)) return true;
	if (e.code && ['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'ENOTFOUND', 'EHOSTUNREACH', 'UND_ERR_SOCKET'].includes(e.code)) return true;
	const status = e.$metadata?.httpStatusCode;
	if (typeof status === 'number' && status >= 500) return true;
	return e.cause ? isStorageFailure(e.cause) : false;
}

/** Which service an error says is unavailable, or null for any other error. */
export function unavailableService(err: unknown, depth = 0): Unavailable | null {
	if (!err || typeof err !== 'object' || depth > 8) return null;
	if (err instanceof StorageUnavailableError) return 'storage';
	// An error of the S3 client (it carries $metadata) is about the store, whatever its code says.
	if ('$metadata' in err) return isStorageFailure(err) ? 'storage' : null;
	const e = err as { code?: unknown; errno?: unknown; message?: unknown; cause?: unknown; errors?: unknown };
	if (typeof e.code === 'string' && DB_CODES.has(e.code)) return 'database';
	if (typeof e.message === 'string' && /write CONNECTION_CLOSED|connect ECONNREFUSED .*:\d+|Connection terminated|timeout exceeded when trying to connect|Client has encountered a connection error|the database system is (starting up|shutting down|in recovery mode)/.test(e.message)) {
		return 'database';
	}
	// AggregateError (several addresses refused), then the cause chain.
	if (Array.isArray(e.errors)) for (const inner of e.errors) {
		const found = unavailableService(inner, depth + 1);
		if (found) return found;
	}
	return unavailableService(e.cause, depth + 1);
}

/** The sentence for a 503, by service. */
export function unavailableMessage(service: Unavailable): string {
	return service === 'database'
		? `The database is not answering right now, so nothing was changed. Try again in ${RETRY_AFTER_S} seconds.`
		: 'Photo storage is not answering right now, so nothing was changed. Try again in a minute.';
}
