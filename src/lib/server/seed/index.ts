import { sql } from 'drizzle-orm';
import { hashPassword } from 'better-auth/crypto';
import { db, type Db, type Tx } from '../db';
import * as schema from '../db/schema';
import { DEMO_MEMBERS, DEMO_PASSWORD, type DemoMemberKey } from './members';
import { seedBuilds } from './builds';

export { DEMO_MEMBERS, DEMO_PASSWORD };

/** Lock id for the seed, so two processes starting at once do not both seed. */
const SEED_LOCK = 7_311_042;

/**
 * Seed the invented demo scenario when the database has no members yet. Idempotent: a second
 * run (or a concurrent one) finds members and does nothing. Returns true when it seeded.
 */
export async function seedDemoIfEmpty(database: Db = db): Promise<boolean> {
	return database.transaction(async (tx) => {
		await tx.execute(sql`select pg_advisory_xact_lock(${SEED_LOCK})`);
		const [{ n }] = await tx.select({ n: sql<number>`count(*)::int` }).from(schema.user);
		if (n > 0) return false;
		await seedDemo(tx);
		return true;
	});
}

async function seedDemo(tx: Tx): Promise<void> {
	const hash = await hashPassword(DEMO_PASSWORD);
	const ids = {} as Record<DemoMemberKey, string>;
	for (const m of DEMO_MEMBERS) {
		const id = crypto.randomUUID();
		ids[m.key] = id;
		await tx.insert(schema.user).values({
			id,
			name: m.name,
			email: m.email,
			emailVerified: true,
			role: m.role,
			handle: m.handle,
			bio: m.bio
		});
		await tx.insert(schema.account).values({
			id: crypto.randomUUID(),
			accountId: id,
			providerId: 'credential',
			userId: id,
			password: hash
		});
	}
	await seedBuilds(tx, ids);
}
