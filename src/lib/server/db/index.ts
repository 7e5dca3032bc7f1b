import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import { env } from '$env/dynamic/private';
import { building } from '$app/environment';
import * as schema from './schema';
import { installProcessGuards } from './process-guards';

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

// Errors nobody caught: logged, and the process ends, except two known ones from a PostgreSQL restart
// (process-guards.ts). Vitest and other hosts install their own handlers.
if (!building && !process.listenerCount('uncaughtException') && !process.listenerCount('unhandledRejection')) {
	installProcessGuards();
}

process.on('sveltekit:shutdown', async () => {
	await client.end({ timeout: 5 });
});
