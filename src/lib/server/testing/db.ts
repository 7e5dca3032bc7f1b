// Integration-test helpers: a throwaway database on the test PostgreSQL server.
import postgres from 'postgres';
import { runMigrations } from '../../../../scripts/migrate.js';

/** Create an empty database next to DATABASE_URL's and return its URL and a drop() function. */
export async function createScratchDatabase(prefix: string) {
	const base = process.env.DATABASE_URL;
	if (!base) throw new Error('DATABASE_URL is not set (run through npm test)');
	const name = `${prefix}_${Date.now().toString(36)}_${Math.random().toString(36).slice(2, 6)}`;
	const adminUrl = new URL(base);
	adminUrl.pathname = '/postgres';
	const admin = postgres(adminUrl.toString(), { max: 1, onnotice: () => {} });
	await admin.unsafe(`create database "${name}"`);
	const url = new URL(base);
	url.pathname = `/${name}`;
	return {
		url: url.toString(),
		migrate: () => runMigrations(url.toString()),
		async drop() {
			await admin.unsafe(`drop database if exists "${name}" with (force)`);
			await admin.end({ timeout: 5 });
		}
	};
}
