import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import { env } from '$env/dynamic/private';
import { building } from '$app/environment';
import * as schema from './schema';

if (!env.DATABASE_URL && !building) throw new Error('DATABASE_URL is not set');

// While `vite build` analyses the server code no connection is made; the URL is a placeholder.
export const client = postgres(env.DATABASE_URL ?? 'postgres://build@127.0.0.1:1/build', {
	max: Number(env.DATABASE_POOL_MAX ?? 10),
	onnotice: () => {}
});

export const db = drizzle(client, { schema });
export type Db = typeof db;
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

process.on('sveltekit:shutdown', async () => {
	await client.end({ timeout: 5 });
});
