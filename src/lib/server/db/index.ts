import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import { env } from '$env/dynamic/private';
import { building } from '$app/environment';
import * as schema from './schema';

if (!env.DATABASE_URL && !building) throw new Error('DATABASE_URL is not set');

// While `vite build` analyses the server code no connection is made; the URL is a placeholder.
// Fail fast when the server is down or slow (the request answers 503 `unavailable`, see
// http/unavailable.ts) instead of hanging: a connection attempt gives up after
// DATABASE_CONNECT_TIMEOUT_S, a statement after DATABASE_STATEMENT_TIMEOUT_MS, a lock wait after
// 5 s. Connections are re-made on the next query once the server is back, so the app recovers
// without a restart.
const seconds = (v: string | undefined, d: number) => (Number.isFinite(Number(v)) && Number(v) > 0 ? Number(v) : d);
export const client = postgres(env.DATABASE_URL ?? 'postgres://build@127.0.0.1:1/build', {
	max: Number(env.DATABASE_POOL_MAX ?? 10),
	connect_timeout: seconds(env.DATABASE_CONNECT_TIMEOUT_S, 5),
	idle_timeout: 60,
	max_lifetime: 60 * 30,
	connection: {
		statement_timeout: seconds(env.DATABASE_STATEMENT_TIMEOUT_MS, 15_000),
		lock_timeout: 5_000,
		idle_in_transaction_session_timeout: 30_000
	},
	onnotice: () => {}
});

export const db = drizzle(client, { schema });
export type Db = typeof db;
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/**
 * postgres.js 3.4.9 (the newest) can throw from a timer when a connection closes between buffering a
 * query and writing it (`socket.write` on a socket it has just set to null) — seen when PostgreSQL
 * restarts under load. The queries of that connection have already failed with CONNECTION_CLOSED (the
 * requests answer 503), so this one error is logged instead of ending the process; any other uncaught
 * error still ends it, as Node would.
 */
function isDriverWriteRace(err: unknown): boolean {
	return err instanceof TypeError && /reading 'write'/.test(err.message) && /postgres[\\/]src[\\/]connection\.js/.test(err.stack ?? '');
}
if (!building && !process.listenerCount('uncaughtException')) {
	process.on('uncaughtException', (err) => {
		if (isDriverWriteRace(err)) {
			console.error('[db] a connection closed while a query was being written; its requests failed with 503');
			return;
		}
		console.error(err);
		process.exit(1);
	});
}

process.on('sveltekit:shutdown', async () => {
	await client.end({ timeout: 5 });
});
