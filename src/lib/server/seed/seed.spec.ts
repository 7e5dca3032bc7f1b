import { describe, it, expect, afterAll, beforeAll } from 'vitest';
import postgres from 'postgres';
import { createScratchDatabase } from '../testing/db';
import { drizzle } from 'drizzle-orm/postgres-js';
import * as schema from '../db/schema';
import { seedDemoIfEmpty, DEMO_MEMBERS } from './index';
import { DEMO_BUILDS } from './content';
import { DEMO_ACCOUNTS } from '../../../../scripts/lib/demo-accounts.js';

describe('demo seed', async () => {
	const scratch = await createScratchDatabase('seed');
	const client = postgres(scratch.url, { max: 4, onnotice: () => {} });
	const database = drizzle(client, { schema });
	beforeAll(() => scratch.migrate());
	afterAll(async () => {
		await client.end({ timeout: 5 });
		await scratch.drop();
	});

	it('seeds once and is idempotent, also when two runs race', async () => {
		const results = await Promise.all([seedDemoIfEmpty(database), seedDemoIfEmpty(database)]);
		expect(results.filter(Boolean)).toHaveLength(1);
		expect(await seedDemoIfEmpty(database)).toBe(false);
		const sql = postgres(scratch.url, { max: 1 });
		try {
			// Every demo member can sign in; one extra invented account (an advertiser) has no password.
			const [{ n }] = await sql`select count(*)::int as n from account where provider_id = 'credential'`;
			expect(n).toBe(DEMO_MEMBERS.length);
			const [{ reports }] = await sql`select count(*)::int as reports from report where state = 'open'`;
			expect(reports).toBe(2);
			const roles = await sql`select distinct role from "user" order by role`;
			expect(roles.map((r) => r.role)).toEqual(['admin', 'maker', 'moderator', 'reviewer']);
			const [{ b }] = await sql`select count(*)::int as b from build`;
			expect(b).toBe(DEMO_BUILDS.length + 1); // plus one derived build
			// The scenario has a review in each state and checks of every level.
			const verdicts = await sql`select verdict from review order by verdict`;
			expect(verdicts.map((r) => r.verdict)).toEqual(['rework', 'safe', 'safe', 'safe']);
			const [{ waiting }] = await sql`select count(*)::int as waiting from build where review_requested_at is not null`;
			expect(waiting).toBe(1);
			const [{ changed }] = await sql`select count(*)::int as changed from build b join review r on r.build_id = b.id where b.revision > r.revision`;
			expect(changed).toBe(1);
			const levels = await sql`select distinct c->>'level' as level from spec_block, jsonb_array_elements(checks) c order by 1`;
			expect(levels.map((r) => r.level)).toEqual(['caution', 'danger', 'note']);
			const [{ photos }] = await sql`select count(*)::int as photos from photo`;
			expect(photos).toBeGreaterThan(8);
		} finally {
			await sql.end({ timeout: 5 });
		}
	}, 180_000);

	it('prints the same demo accounts that it seeds', () => {
		expect(DEMO_ACCOUNTS.members.map((m) => `${m.role}:${m.email}`)).toEqual(
			DEMO_MEMBERS.map((m) => `${m.role}:${m.email}`)
		);
	});
});
