/**
 * The process's last line for errors nobody caught. Node ends the process on an uncaught exception and on
 * an unhandled promise rejection; so do we, except for two known errors of our dependencies that come
 * from a PostgreSQL restart and that the code which would have to catch them does not own:
 *
 * - postgres.js 3.4.9 (the newest) can throw from a timer when a connection closes between buffering a
 *   query and writing it (`socket.write` on a socket it has just set to null). The queries of that
 *   connection have already failed with CONNECTION_CLOSED (the requests answer 503).
 * - pg-boss 10.4.2 (the newest for Node 20; 11 and later need Node 22) does not await the `complete` /
 *   `fail` call its worker makes after a job (`manager.js` `watch` → `onFetch`), so when PostgreSQL is
 *   down at that moment their rejection (ECONNREFUSED, "Connection terminated…", 57P01…) is unhandled.
 *   The job stays active in the queue and pg-boss retries it once it expires; the worker loop goes on
 *   polling and recovers when the server is back.
 *
 * Each is logged in one line; anything else is logged and ends the process with exit code 1, as Node would.
 */

import { unavailableService } from '../http/unavailable';

type Proc = Pick<NodeJS.Process, 'on' | 'exit'>;

export function isDriverWriteRace(err: unknown): boolean {
	return err instanceof TypeError && /reading 'write'/.test(err.message) && /postgres[\\/]src[\\/]connection\.js/.test(err.stack ?? '');
}

/**
 * A connection error raised by pg-boss's own code: what the app answers 503 for (http/unavailable.ts, one list
 * of codes and messages for both), with a stack that runs through pg-boss/src (node-postgres's pool re-captures
 * the stack where the query was made, so `Db.executeSql` and `Manager.complete` are in it).
 */
export function isQueueConnectionError(err: unknown): boolean {
	return err instanceof Error && unavailableService(err) === 'database' && /[\\/]pg-boss[\\/]src[\\/]/.test(err.stack ?? '');
}

function fatal(proc: Proc, err: unknown): void {
	console.error(err);
	proc.exit(1);
}

/** Install the two handlers (once per process; the caller checks that nobody else has). */
export function installProcessGuards(proc: Proc = process): void {
	proc.on('uncaughtException', (err: unknown) => {
		if (isDriverWriteRace(err)) {
			console.error('[db] a connection closed while a query was being written; its requests failed with 503');
			return;
		}
		fatal(proc, err);
	});
	proc.on('unhandledRejection', (reason: unknown) => {
		if (isQueueConnectionError(reason)) {
			const { code, message } = reason as Error & { code?: string };
			console.error(`[queue] PostgreSQL unreachable while the queue marked a job done (${code ?? message}); the job is retried when it expires`);
			return;
		}
		fatal(proc, reason);
	});
}
