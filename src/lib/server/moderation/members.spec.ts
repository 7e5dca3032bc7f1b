import { describe, it, expect, afterAll } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { isHttpError } from '@sveltejs/kit';
import { db } from '../db';
import * as schema from '../db/schema';
import { setMemberRole as setRole, setMemberSuspended as setSuspended } from '.';
import { createTestUser, removeTestUsers } from '../testing/builds';

async function statusOf(p: Promise<unknown>): Promise<number | 'ok'> {
	try {
		await p;
		return 'ok';
	} catch (e) {
		if (isHttpError(e)) return e.status;
		throw e;
	}
}

// Appointment rules from PRODUCT.md §2: admins appoint moderators, moderators appoint reviewers.
describe('roles and suspension', () => {
	const made: string[] = [];
	const member = async (role: 'maker' | 'reviewer' | 'moderator' | 'admin') => {
		const u = await createTestUser(role, 'Member Rules');
		made.push(u.id);
		return u;
	};
	afterAll(() => removeTestUsers(made));

	it('lets an admin appoint a moderator and a moderator only reviewers', async () => {
		const admin = await member('admin');
		const mod = await member('moderator');
		const maker = await member('maker');
		expect(await statusOf(setRole(mod, maker.id, 'moderator'))).toBe(403);
		expect(await statusOf(setRole(mod, maker.id, 'reviewer'))).toBe('ok');
		expect(await statusOf(setRole(admin, maker.id, 'moderator'))).toBe('ok');
		expect(await statusOf(setRole(mod, maker.id, 'maker'))).toBe(403); // now a moderator: out of a moderator's reach
		expect(await statusOf(setRole(admin, admin.id, 'maker'))).toBe(403); // never one's own role
		const audit = await db
			.select()
			.from(schema.auditEntry)
			.where(and(eq(schema.auditEntry.targetId, maker.id), eq(schema.auditEntry.action, 'member.role')));
		expect(audit.map((a) => a.details)).toEqual(
			expect.arrayContaining([
				{ from: 'maker', to: 'reviewer' },
				{ from: 'reviewer', to: 'moderator' }
			])
		);
	});

	it('refuses to appoint a suspended member, and suspension ends their sessions', async () => {
		const mod = await member('moderator');
		const maker = await member('maker');
		await db.insert(schema.session).values({
			id: crypto.randomUUID(),
			token: crypto.randomUUID(),
			userId: maker.id,
			expiresAt: new Date(Date.now() + 3600_000),
			updatedAt: new Date()
		});
		await setSuspended(mod, maker.id, true, 'spam');
		expect(await db.select().from(schema.session).where(eq(schema.session.userId, maker.id))).toHaveLength(0);
		expect(await statusOf(setRole(mod, maker.id, 'reviewer'))).toBe(409);
		await setSuspended(mod, maker.id, false, 'appeal accepted');
		expect(await statusOf(setRole(mod, maker.id, 'reviewer'))).toBe('ok');
	});
});
