// Integration-test helpers for builds: throwaway members of any role, cleaned up by id.
import { inArray } from 'drizzle-orm';
import { db } from '../db';
import * as schema from '../db/schema';
import type { Role } from '$lib/roles';

const tag = () => `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 7)}`;

/** A fresh member with a unique e-mail and handle. → { id, role, name, handle } (an Actor for the builds module). */
export async function createTestUser(role: Role = 'maker', name = 'Build Tester') {
	const t = tag();
	const id = crypto.randomUUID();
	await db.insert(schema.user).values({
		id,
		name: `${name} ${t}`,
		email: `build-${t}@example.test`,
		emailVerified: true,
		handle: `bt${t}`,
		role
	});
	return { id, role, name: `${name} ${t}`, handle: `bt${t}` };
}

/** Remove test members; their builds, steps, revisions and audit rows go with them (cascades). */
export async function removeTestUsers(ids: string[]): Promise<void> {
	if (ids.length) await db.delete(schema.user).where(inArray(schema.user.id, ids));
}

/** A unique title, so slugs never depend on what else is in the database. */
export function uniqueTitle(base = 'Test chip amp'): string {
	return `${base} ${tag()}`;
}
