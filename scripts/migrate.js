// Apply the committed Drizzle migrations in drizzle/ to DATABASE_URL.
import { drizzle } from 'drizzle-orm/postgres-js';
import { migrate } from 'drizzle-orm/postgres-js/migrator';
import postgres from 'postgres';
import { fileURLToPath } from 'node:url';
import path from 'node:path';

/** Run all pending migrations against url. */
export async function runMigrations(url) {
	const sql = postgres(url, { max: 1, onnotice: () => {} });
	try {
		const folder = path.join(path.dirname(fileURLToPath(import.meta.url)), '..', 'drizzle');
		await migrate(drizzle(sql), { migrationsFolder: folder });
	} finally {
		await sql.end({ timeout: 5 });
	}
}

if (import.meta.url === `file://${process.argv[1]}`) {
	if (!process.env.DATABASE_URL) {
		console.error('DATABASE_URL is not set');
		process.exit(1);
	}
	await runMigrations(process.env.DATABASE_URL);
	console.log('migrations applied');
}
