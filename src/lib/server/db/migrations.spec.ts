import { describe, it, expect, afterAll } from 'vitest';
import postgres from 'postgres';
import { createScratchDatabase } from '../testing/db';

describe('migrations', async () => {
	const scratch = await createScratchDatabase('migr');
	afterAll(() => scratch.drop());

	it('apply on an empty database and again without change', async () => {
		await scratch.migrate();
		await scratch.migrate(); // a re-run is a no-op
		const sql = postgres(scratch.url, { max: 1, onnotice: () => {} });
		try {
			const rows = await sql<{ table_name: string }[]>`
				select table_name from information_schema.tables where table_schema = 'public' order by table_name`;
			const names = rows.map((r) => r.table_name);
			for (const t of ['user', 'session', 'account', 'verification', 'build', 'build_step', 'photo', 'spec_block', 'part_line', 'build_revision', 'review', 'safety_flag', 'comment', 'report', 'audit_entry', 'bench_item']) {
				expect(names).toContain(t);
			}
			// The full-text column is maintained by the database itself.
			const [b] = await sql`insert into "user" (id, name, email) values ('u1', 'T', 't@example.test') returning id`;
			const [row] = await sql`insert into build (slug, owner_id, title, summary, category, topology, search_text)
				values ('s', ${b.id}, 'Quiet reservoir', 'bleeder resistors', 'power-supply', 'other', 'heatsink')
				returning (search @@ plainto_tsquery('english', 'reservoirs')) as hit, (search @@ plainto_tsquery('english', 'heatsink')) as hit2`;
			expect(row.hit).toBe(true);
			expect(row.hit2).toBe(true);
			await expect(sql`insert into build (slug, owner_id, title, category, topology, status) values ('s2', ${b.id}, 'x', 'other', 'other', 'bogus')`).rejects.toThrow(/build_status_check/);
		} finally {
			await sql.end({ timeout: 5 });
		}
	});
});
